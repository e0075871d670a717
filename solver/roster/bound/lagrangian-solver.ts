/**
 * The person/shift Lagrangian (lagrangian.ts) behind the MapSolver interface of
 * solver/inference/map-solver.ts: one entry point, `lagrangianSolver.solve({ compiled, incumbent },
 * options, signal)`, with its own typed options record over the base record's defaults, and the
 * MapResult every algorithm returns (the incumbent's roster, or a better one the relaxation found,
 * with the lowest L(μ, ν) as its bound, the history of the bound and a stop reason).
 *
 * The dual methods, chosen by `method`:
 * - 'columnGeneration': Dantzig–Wolfe with HiGHS as the master (column-generation.ts); it solves
 *   the relaxation exactly on small rosters and falls back to the dual method below when HiGHS fails;
 * - 'bundle': the proximal bundle method (bundle.ts);
 * - 'subgradient': deflected subgradient steps with Polyak steps (lagrangian.ts lagrangianSteps);
 * - 'auto': column generation up to `columnGenerationMaxMu` (shift, person) multipliers, else
 *   `largeMethod`.
 * Work runs in slices of `sliceMs` so an abort or the event loop is never kept waiting.
 */
import type { MapResult, MapSolver, StopReason } from '../../inference/map-solver';
import { relativeGap } from '../../inference/map-solver';
import { DEFAULT_BASE_OPTIONS, withDefaults, type BaseMapOptions } from '../../inference/options';
import { tick } from '../../inference/solve';
import { score as modelScore } from '../../model/score';
import type { CompiledRoster } from '../compile';
import { applyDual, buildLagrangian, dualOf, lagrangianSteps, newLagrangianState, type DualStart, type LagrangianSetup } from '../lagrangian';
import { bundleBest, bundleSteps, DEFAULT_BUNDLE_OPTIONS, newBundleState, type BundleOptions } from './bundle';
import { createColumnGeneration } from './column-generation';
import { loadHighsRuntime } from './highs';

export type LagrangianMethod = 'auto' | 'columnGeneration' | 'bundle' | 'subgradient';

export interface LagrangianSolverOptions extends BaseMapOptions {
  method: LagrangianMethod;
  /** 'auto' uses column generation up to this many (shift, person) multipliers (measured: 340 converge in ~2 s; the demo's 1,494 need minutes). */
  columnGenerationMaxMu: number;
  /** What 'auto' runs above columnGenerationMaxMu. */
  largeMethod: 'bundle' | 'subgradient';
  /** Clock reading the time limit counts from (default: when solve starts); a caller that spent part of its budget already passes its own start. */
  startedAt?: number;
  /** Multipliers of an earlier run of this roster (the result's `dual`): the dual method starts there. */
  dualStart?: DualStart;
  /** The bound as reported (e.g. rounded down to the score grid; must stay a bound); identity by default. */
  roundBound?: (bound: number) => number;
  /** Longest time between yields to the event loop. */
  sliceMs: number;
  /** Subgradient: evaluations without a new best before the step halves; 0 = one per 28 multipliers, between 8 and 50. */
  patience: number;
  /** Subgradient: weight of the previous direction. */
  deflection: number;
  bundle: BundleOptions;
  /** Build: longest span in days kept exact in the person DP. */
  maxLookback: number;
  /** Build: cap on DP transitions over all people (memory); above it the model is unsupported. */
  maxTransitions: number;
}

export const DEFAULT_LAGRANGIAN_OPTIONS: Readonly<LagrangianSolverOptions> = Object.freeze({
  ...DEFAULT_BASE_OPTIONS,
  method: 'auto',
  columnGenerationMaxMu: 800,
  largeMethod: 'bundle',
  sliceMs: 50,
  patience: 0,
  deflection: 0.7,
  bundle: DEFAULT_BUNDLE_OPTIONS,
  maxLookback: 6,
  maxTransitions: 12_000_000,
} satisfies LagrangianSolverOptions);

/** The roster to bound and the best known roster of it (its bound too: the result's bound is never above it). */
export interface LagrangianInput {
  compiled: CompiledRoster;
  incumbent: Pick<MapResult, 'assignment' | 'score' | 'bound' | 'timeToBestMs'>;
}

export interface LagrangianResult extends MapResult {
  /** The multipliers at the best bound, named to survive recompiling: the next run's dualStart. */
  dual?: DualStart;
  /** Why the model does not fit the decomposition (the result is then the incumbent unchanged). */
  unsupported?: string;
  /** Time the build of the relaxation took (clock ms). */
  buildMs: number;
}

/** A MapSolver whose result also carries the multipliers (and why a model does not fit). */
export interface LagrangianSolver extends MapSolver<LagrangianSolverOptions, LagrangianInput> {
  solve(input: LagrangianInput, options?: Partial<LagrangianSolverOptions>, signal?: AbortSignal): Promise<LagrangianResult>;
}

export const lagrangianSolver: LagrangianSolver = {
  name: 'lagrangian',
  defaults: DEFAULT_LAGRANGIAN_OPTIONS,
  solve: (input, options, signal) => solveLagrangian(input, withDefaults(DEFAULT_LAGRANGIAN_OPTIONS, options), signal),
};

async function solveLagrangian({ compiled, incumbent }: LagrangianInput, o: LagrangianSolverOptions, signal?: AbortSignal): Promise<LagrangianResult> {
  const now = o.clock ?? Date.now;
  const t0 = now();
  const startedAt = o.startedAt ?? t0;
  const deadline = startedAt + o.timeLimitMs;
  const round = o.roundBound ?? ((b: number) => b);
  const result: LagrangianResult = {
    assignment: incumbent.assignment,
    score: incumbent.score,
    bound: incumbent.bound,
    gap: relativeGap(incumbent.score, incumbent.bound),
    feasible: incumbent.score > -Infinity,
    optimal: false,
    method: '',
    iterations: 0,
    timeMs: 0,
    timeToBestMs: incumbent.timeToBestMs,
    stopReason: 'time',
    history: [],
    beliefs: null,
    buildMs: 0,
  };
  // every reading goes through clock, so the result's times need no reading of their own
  let lastReading = t0;
  const clock = () => (lastReading = now());
  const built = buildLagrangian(compiled, { deadline, now: clock, maxLookback: o.maxLookback, maxTransitions: o.maxTransitions });
  if ('unsupported' in built) return { ...result, unsupported: built.unsupported, timeMs: lastReading - startedAt };
  const setup: LagrangianSetup = built;
  result.buildMs = clock() - t0;
  let lastProgress = clock();
  // the bound as reported: rounded, never below the roster, closing the gap once it meets it
  const settle = () => {
    result.bound = Math.max(result.score, round(result.bound));
    result.gap = relativeGap(result.score, result.bound);
    if (result.score > -Infinity && result.bound <= result.score + 1e-9) {
      result.optimal = true;
      result.stopReason = 'gap';
    }
  };
  const report = (bound: number, iterations: number) => {
    if (bound >= result.bound) return;
    result.bound = Math.max(bound, result.score);
    settle();
    result.history.push({ iteration: iterations, timeMs: clock() - startedAt, score: result.score, bound: result.bound });
    if (o.onProgress && clock() - lastProgress >= o.progressEveryMs) {
      lastProgress = clock();
      o.onProgress({ iteration: iterations, timeMs: clock() - startedAt, score: result.score, bound: result.bound, gap: result.gap });
    }
  };
  const done = () => result.optimal || (result.score > -Infinity && result.bound - result.score <= o.absoluteTolerance);
  const stop = (reason: StopReason) => {
    if (result.optimal) reason = 'gap';
    else if (signal?.aborted) reason = 'aborted';
    result.stopReason = reason;
    result.timeMs = lastReading - startedAt;
    return result;
  };
  // Every dual method runs in slices: a slice of steps, a report, a turn for the event loop; until
  // the time is up, an abort, a proof, or the method says it has converged.
  const runSlices = async (offset: number, slice: (sliceDeadline: number) => { best: number; iterations: number; converged: boolean }) => {
    while (clock() < deadline && !signal?.aborted) {
      const s = slice(Math.min(deadline, clock() + o.sliceMs));
      report(s.best, offset + s.iterations);
      if (done()) {
        result.optimal = true;
        result.stopReason = 'gap';
        return;
      }
      if (s.converged) return;
      await tick();
    }
  };
  const method = o.method === 'auto' ? (setup.nMu <= o.columnGenerationMaxMu ? 'columnGeneration' : o.largeMethod) : o.method;
  let dualStart = o.dualStart;
  const methods: string[] = [];

  if (method === 'columnGeneration') {
    const highs = await loadHighsRuntime().catch(() => null);
    if (highs) {
      const cg = createColumnGeneration(setup, highs, { incumbent: result.score > -Infinity ? result.assignment : undefined, start: dualStart });
      try {
        await runSlices(0, (sliceDeadline) => {
          cg.run(sliceDeadline, clock);
          return { best: cg.bound, iterations: cg.rounds, converged: cg.converged || Boolean(cg.failed) };
        });
        result.iterations = cg.rounds;
        // the master's own solution, put together shift by shift, is often the optimum itself
        const x = cg.lpRoster();
        if (x) {
          const sc = modelScore(compiled.model, x);
          if (sc > result.score) {
            result.assignment = Array.from(x);
            result.score = sc;
            result.feasible = true;
            result.timeToBestMs = clock() - startedAt;
            settle();
            result.history.push({ iteration: cg.rounds, timeMs: result.timeToBestMs, score: result.score, bound: result.bound });
          }
        }
        methods.push('column-generation');
        if (done()) (result.optimal = true), (result.stopReason = 'gap');
        // a master HiGHS could not solve: a dual method goes on from here (below)
        if (!cg.failed || result.optimal) {
          if (Number.isFinite(cg.bound)) result.dual = cg.dual();
          result.method = methods.join('+');
          return stop(cg.converged ? 'stalled' : 'time');
        }
        if (!dualStart && Number.isFinite(cg.bound)) dualStart = cg.dual();
      } catch {
        // HiGHS failed on the master: the bounds reported so far stay valid; a dual method takes over
      } finally {
        cg.dispose();
      }
    }
  }
  const target = result.score > -Infinity ? result.score : undefined;
  const offset = result.iterations;
  // the multipliers to start from: an earlier run's (or the failed master's), else zero
  const start = newLagrangianState(setup);
  if (dualStart) applyDual(setup, dualStart, start.mu, start.nu);
  if (method === 'bundle') {
    const state = newBundleState(setup, dualStart ? start : undefined);
    await runSlices(offset, (sliceDeadline) => {
      bundleSteps(setup, state, { deadline: sliceDeadline, now: clock, target }, o.bundle);
      return { best: state.best, iterations: state.iterations, converged: state.converged };
    });
    methods.push('bundle');
    result.iterations = offset + state.iterations;
    result.method = methods.join('+');
    if (Number.isFinite(state.best)) {
      const best = bundleBest(setup, state);
      result.dual = dualOf(setup, best.mu, best.nu);
    }
    return stop(state.converged ? 'stalled' : 'time');
  }
  const state = start;
  await runSlices(offset, (sliceDeadline) => {
    lagrangianSteps(setup, state, { deadline: sliceDeadline, now: clock, target, patience: o.patience > 0 ? o.patience : undefined, deflection: o.deflection });
    return { best: state.best, iterations: state.iterations, converged: false };
  });
  methods.push('lagrangian');
  result.iterations = offset + state.iterations;
  result.method = methods.join('+');
  if (state.bestMu) result.dual = dualOf(setup, state.bestMu, state.bestNu!);
  return stop('time');
}
