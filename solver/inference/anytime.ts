/**
 * What every anytime MAP run keeps: the incumbent (scored exactly and on the big-M engine), the
 * bound, the history and progress reports, and the result; plus the two ways of driving a run
 * written as a generator (to the end, or yielding to the event loop between slices), and the
 * MapSolver every algorithm is made into from its run (`anytimeSolver`).
 */
import type { Model } from '../model/types';
import { score as exactScore } from '../model/score';
import { buildEngine, engineScore, type Engine } from './engine';
import { relativeGap, type HistoryPoint, type MapResult, type MapSolver, type StopReason } from './map-solver';
import { withDefaults, type BaseMapOptions, type Progress } from './options';

export class AnytimeRun {
  readonly now: () => number;
  readonly t0: number;
  readonly deadline: number;
  readonly history: HistoryPoint[] = [];
  iterations = 0;
  bestX: Int32Array | null = null;
  /** Big-M score of the incumbent. */
  bestBig = -Infinity;
  bound = Infinity;
  timeToBest = 0;
  result?: MapResult;
  private lastProgress = 0;
  // exact score of the incumbent, recomputed only when the incumbent changes
  private cachedFor: Int32Array | null = null;
  private cachedScore = -Infinity;

  constructor(
    readonly model: Model,
    readonly engine: Engine,
    readonly options: BaseMapOptions,
    t0?: number,
  ) {
    this.now = options.clock ?? Date.now;
    this.t0 = t0 ?? this.now();
    this.deadline = this.t0 + options.timeLimitMs;
  }

  elapsed(): number {
    return this.now() - this.t0;
  }

  trueScore(x: Int32Array): number {
    if (x !== this.cachedFor) {
      this.cachedFor = x;
      this.cachedScore = exactScore(this.model, x);
    }
    return this.cachedScore;
  }

  record(): void {
    const s = this.bestX ? this.trueScore(this.bestX) : -Infinity;
    const p: HistoryPoint = { iteration: this.iterations, timeMs: this.elapsed(), score: s, bound: this.bound };
    const h = this.history, last = h[h.length - 1];
    if (!last || last.score !== p.score || last.bound !== p.bound) h.push(p);
    if (h.length > 2000) h.splice(1, h.length - 1000); // keep first and recent points
  }

  progress(force = false): void {
    const report = this.options.onProgress;
    if (!report) return;
    const now = this.elapsed();
    if (!force && now - this.lastProgress < this.options.progressEveryMs) return;
    this.lastProgress = now;
    const s = this.bestX ? this.trueScore(this.bestX) : -Infinity;
    const p: Progress = { iteration: this.iterations, timeMs: now, score: s, bound: this.bound, gap: relativeGap(s, this.bound) };
    report(p);
  }

  /** Keep x when it beats the incumbent on the big-M score; true when kept. */
  offer(x: Int32Array, big?: number): boolean {
    const s = big ?? engineScore(this.engine, x);
    if (s > this.bestBig + 1e-9 || this.bestX === null) {
      this.bestBig = s;
      this.bestX = Int32Array.from(x);
      this.timeToBest = this.elapsed();
      this.record();
      return true;
    }
    return false;
  }

  gapClosed(): boolean {
    if (!this.bestX) return false;
    const s = this.trueScore(this.bestX);
    if (s === -Infinity) return false;
    return this.bound - s <= this.options.absoluteTolerance || relativeGap(s, this.bound) <= this.options.relativeGap;
  }

  finish(method: string, stopReason: StopReason, optimal: boolean, beliefs: Float64Array[] | null = null): void {
    const engine = this.engine;
    if (!optimal && (this.bestX === null || this.trueScore(this.bestX) === -Infinity)) {
      // out of time while infeasible: the keyless start, unimproved, may still be feasible
      const safe = safeStart(engine);
      if (exactScore(this.model, safe) > -Infinity) {
        this.bestX = safe;
        this.bestBig = engineScore(engine, safe);
        this.timeToBest = this.elapsed();
      }
    }
    const x = this.bestX ?? new Int32Array(engine.n);
    const s = this.trueScore(x);
    let b = this.bound;
    if (optimal) b = s;
    // rounding noise of the dual may leave the bound a hair under the score
    if (b < s && s - b <= 1e-6 * Math.max(1, Math.abs(s))) b = s;
    if (optimal && s === -Infinity) stopReason = 'infeasible';
    const gap = relativeGap(s, b);
    this.record();
    this.result = {
      assignment: Array.from(x),
      score: s,
      bound: b,
      gap,
      feasible: s > -Infinity,
      optimal: optimal || (s > -Infinity && b - s <= this.options.absoluteTolerance),
      method,
      iterations: this.iterations,
      timeMs: this.elapsed(),
      timeToBestMs: this.timeToBest,
      stopReason,
      history: this.history,
      beliefs,
    };
    this.progress(true);
  }
}

/** A run whose clock starts before the model is compiled: building the engine counts against the budget. */
export function startRun(model: Model, options: BaseMapOptions): AnytimeRun {
  const t0 = (options.clock ?? Date.now)();
  const engine = buildEngine(model, { hardPenalty: options.hardPenalty });
  return new AnytimeRun(model, engine, options, t0);
}

/** Per variable: the best keyless value by its unary score if there is one, else the best value. */
export function safeStart(engine: Engine): Int32Array {
  return Int32Array.from(engine.theta, (t, i) => {
    const g = engine.keys.group[i]!;
    let best = -1, any = 0;
    for (let x = 0; x < t.length; x++) {
      if (t[x]! > t[any]!) any = x;
      if (g[x] === 0 && (best < 0 || t[x]! > t[best]!)) best = x;
    }
    return best >= 0 && t[best]! > -engine.H / 2 ? best : any;
  });
}

/** Per variable: the value its unary scores prefer (lowest index on ties). */
export function unaryStart(engine: Engine): Int32Array {
  return Int32Array.from(engine.theta, (t) => {
    let bi = 0;
    for (let x = 1; x < t.length; x++) if (t[x]! > t[bi]!) bi = x;
    return bi;
  });
}

/** A run written as a generator: it yields wherever the caller may pause or check the signal. */
export type RunSteps = Generator<void, void, void>;

export function runToEnd(steps: RunSteps): void {
  while (!steps.next().done) {
    /* run to completion */
  }
}

/** Lets the event loop run (an abort, a progress write) between slices of work; setTimeout where setImmediate is missing (a browser). */
export const tick: () => Promise<void> =
  typeof setImmediate === 'function' ? () => new Promise((r) => setImmediate(r)) : () => new Promise((r) => setTimeout(r, 0));

/** Run to the end, giving the event loop a turn every 20 ms so an AbortSignal from elsewhere can stop it. */
export async function runYielding(steps: RunSteps): Promise<void> {
  let last = Date.now();
  while (!steps.next().done) {
    if (Date.now() - last > 20) {
      await tick();
      last = Date.now();
    }
  }
}

/**
 * The MapSolver of an algorithm written as a run: the caller's options over `defaults`, the run
 * started on them (the engine is built on the run's clock), then driven to the end (solveSync)
 * or with the event loop's turns between slices (solve).
 */
export function anytimeSolver<O extends BaseMapOptions>(
  name: string,
  defaults: Readonly<O>,
  steps: (run: AnytimeRun, opt: O, signal: AbortSignal | undefined) => RunSteps,
): MapSolver<O> {
  const begin = (model: Model, options: Partial<O> | undefined): { run: AnytimeRun; opt: O } => {
    const opt = withDefaults(defaults, options);
    return { run: startRun(model, opt), opt };
  };
  return {
    name,
    defaults,
    async solve(model, options, signal): Promise<MapResult> {
      const { run, opt } = begin(model, options);
      await runYielding(steps(run, opt, signal));
      return run.result!;
    },
    solveSync(model, options, signal): MapResult {
      const { run, opt } = begin(model, options);
      runToEnd(steps(run, opt, signal));
      return run.result!;
    },
  };
}
