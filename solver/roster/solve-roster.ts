/**
 * One call from a validated roster to a solved, decoded and independently scored roster,
 * for the CLI and the server's run worker: pre-check (explainInfeasible), compile, solve from
 * the greedy start, decode, score with scoreRoster.
 */
import type { Roster, RosterAssignment } from '../../shared/roster/schema';
import { solveMap, type MapOptions, type MapResult } from '../inference';
import { DEFAULT_MAP_OPTIONS } from '../inference/options';
import { relativeGap, tick } from '../inference/solve';
import type { DualStart } from './lagrangian';
import { lagrangianSolver } from './bound/lagrangian-solver';
import { loadHighsRuntime } from './bound/highs';
import { roundToGrid, rosterIdeal, scoreGrid } from './bound/grid';
import { PROVE_SMALL_MAX_VALUES, proveSmall, seatValues } from './bound/prove-small';
import { score as modelScore } from '../model/score';
import { compileRoster, type CompiledRoster } from './compile';
import { decodeAssignment, encodeAssignment, type DecodedRoster } from './decode';
import { explainInfeasible } from './explain-infeasible';
import { greedyAssignment } from './greedy';
import { createLns } from './lns';
import { scoreRoster, type RosterScore } from './score-roster';

export type SolveRosterResult =
  | { status: 'infeasible'; reasons: string[] }
  | {
      status: 'solved';
      compiled: CompiledRoster;
      result: MapResult;
      decoded: DecodedRoster;
      /** scoreRoster of the decoded roster: equals result.score (the tests check that). */
      score: RosterScore;
      /**
       * The score if every rule, wish and pairing were at its own best (bound/grid.ts). The roster
       * concedes ideal − score points; no roster concedes fewer than ideal − result.bound.
       */
      ideal: { total: number; terms: RosterScore['terms'] };
      /** Step of the score grid (every roster scores constant + k·step); result.bound is rounded down to it. */
      grid: number;
      /** The person-decomposition multipliers at its best bound: pass as `dualStart` to the next run of this roster. */
      dual?: DualStart;
    };

export type SolveRosterOptions = Partial<MapOptions> & {
  start?: RosterAssignment;
  /**
   * The person-decomposition bound (lagrangian.ts): share of the time limit it gets after the
   * search (default 0.45); 0 turns it off. The reported bound is the lower of it and MPLP's, both
   * proven upper bounds.
   */
  lagrangianShare?: number;
  /** Multipliers of an earlier run of this roster (SolveRosterResult.dual): the bound starts there. */
  dualStart?: DualStart;
  /**
   * Share of the search's time (what the bound leaves) given to large-neighbourhood search
   * (lns.ts: whole days and whole schedules re-planned exactly by HiGHS) after the local search;
   * default 0.9; 0 turns it off.
   */
  lnsShare?: number;
  /**
   * Models with more factors than this skip the engine (MPLP and local search) and go from the
   * start roster straight to LNS (default ENGINE_MAX_FACTORS; tests lower it).
   */
  engineMaxFactors?: number;
  /**
   * Rosters of at most PROVE_SMALL_MAX_VALUES seat values: share of the time left after the search that
   * HiGHS's MIP of the whole roster gets, started from the search's roster (bound/prove-small.ts),
   * before the person-decomposition bound; default 0.5; 0 turns it off (so does lagrangianShare 0).
   */
  proofShare?: number;
  /** Largest roster that gets the proof step, in seat values (Σ over seats of who may take it, open included; default PROVE_SMALL_MAX_VALUES). */
  proofMaxValues?: number;
  /**
   * Load HiGHS on V8's baseline compiler for rosters that get the proof step (default true). Only for a
   * process that solves one roster: once loaded that way, later loads in the same process, other threads
   * included, keep baseline speed (measured: 12 × 2 weeks' cold MIP 3.1–3.25 s in a thread after one,
   * 2.0–2.8 s without), and demo-sized rosters lose by it (bound/highs.ts).
   */
  highsBaseline?: boolean;
};

/**
 * Solve a roster. `start`, when given, is a filled roster to start from (e.g. the published
 * one, or a coordinator's edit); seats it cannot express (someone no longer eligible) fall
 * back to the greedy start, as does a start that scores below it. Other MapOptions pass through (time limit, seed, onProgress…).
 */
export async function solveRoster(roster: Roster, options: SolveRosterOptions = {}, signal?: AbortSignal): Promise<SolveRosterResult> {
  const reasons = explainInfeasible(roster);
  if (reasons.length) return { status: 'infeasible', reasons };
  const now = options.clock ?? Date.now;
  const t0 = now();
  const wall0 = Date.now();
  const compiled = compileRoster(roster);
  const { start, lagrangianShare = 0.45, dualStart, lnsShare = 0.9, engineMaxFactors = ENGINE_MAX_FACTORS, proofShare = 0.5, proofMaxValues = PROVE_SMALL_MAX_VALUES, highsBaseline = true, ...mapOptions } = options;
  const timeLimitMs = mapOptions.timeLimitMs ?? DEFAULT_MAP_OPTIONS.timeLimitMs;
  // small rosters get the proof step after the search; their HiGHS stays on the baseline compiler
  // (bound/highs.ts wasmTiering: a cold start costs less there, and small rosters only start it)
  const proving = lagrangianShare > 0 && proofShare > 0 && seatValues(compiled) <= proofMaxValues;
  if (proving && highsBaseline) await loadHighsRuntime({ baseline: true }).catch(() => null);
  let initial = greedyAssignment(compiled);
  if (start) {
    // The given roster (e.g. the previous run), with today's pins, wins unless greedy scores better:
    // a pin it does not follow, or a seat it cannot express, makes it lose.
    const enc = encodeAssignment(compiled, withPins(roster, start));
    if (enc.ok && modelScore(compiled.model, enc.values) >= modelScore(compiled.model, initial)) initial = enc.values;
  }
  // small rosters: the search has its best early (12 × 2 weeks: 0.08 s) and column generation,
  // which can prove it, needs the time; so the bound gets most of it unless the caller says otherwise
  const small = options.lagrangianShare === undefined && roster.seats.length <= SMALL_ROSTER_SEATS;
  const share = Math.min(0.9, Math.max(0, small ? 0.7 : lagrangianShare));
  // compiling counts against the limit, but the search keeps a minimum (a short re-solve of a
  // large roster would otherwise get no search at all)
  const searchMs = Math.max(Math.min(200, timeLimitMs * (1 - share)), timeLimitMs * (1 - share) - (now() - t0));
  // local search first (quick gains from a greedy start), then LNS for the larger moves
  const lnsMs = searchMs * Math.min(0.95, Math.max(0, lnsShare));
  const tSearch = now();
  // large models skip the engine (MPLP and local search) and give the search's time to LNS: the
  // engine is what costs there, and it gains next to nothing (ENGINE_MAX_FACTORS)
  // (LNS needs a feasible start; without one the engine's search is what can repair it)
  const x0 = Int32Array.from(mapOptions.initial ?? initial);
  const highs = lnsMs > 0 && compiled.model.factors.length > engineMaxFactors && modelScore(compiled.model, x0) > -Infinity ? await loadHighsRuntime().catch(() => null) : null;
  const result = highs
    ? startResult(compiled, x0, now() - t0)
    : await solveMap(compiled.model, { ...mapOptions, timeLimitMs: searchMs - lnsMs, initial: mapOptions.initial ?? initial }, signal);
  const grid = scoreGrid(compiled.model);
  onGrid(result, compiled, grid);
  if (lnsMs > 0 && !result.optimal && !signal?.aborted && result.score > -Infinity) {
    await improveByLns(compiled, result, tSearch + searchMs, now, t0, mapOptions, grid, signal);
  }
  // the whole call so far, compiling included (the bound's history goes on from here)
  result.timeMs = now() - t0;
  // small rosters: the whole MIP can prove what the decomposition cannot (its integrality gap)
  // (its bound, after HiGHS's cuts, is below what the decomposition reaches there: 12 × 2 weeks
  // −36.5 against −34, so the decomposition is then skipped and LNS gets its time: a roster
  // reaching the MIP's bound is proven best)
  let mipBounded = false;
  if (proving && !result.optimal && !signal?.aborted && result.score > -Infinity) {
    // HiGHS counts wall-clock time: its limit follows the pace of the caller's clock so far (a CPU
    // clock on a loaded machine runs slower than the wall), between 1 and 4 wall ms per clock ms
    const pace = Math.min(4, Math.max(1, (Date.now() - wall0) / Math.max(1, now() - t0)));
    mipBounded = await proveByMip(roster, compiled, result, (t0 + timeLimitMs - now()) * Math.min(1, proofShare), pace, now, t0, grid);
  }
  let dual: DualStart | undefined;
  if (share > 0 && !mipBounded && !result.optimal && !signal?.aborted) dual = await tightenWithLagrangian(compiled, result, t0, timeLimitMs, now, mapOptions, grid, dualStart, signal);
  // a bound that converged early (column generation at the LP optimum, above the best roster: an
  // integrality gap) leaves time: LNS goes on with it (12 × 2 weeks: converged at 2.3 s of 4 s,
  // bound −34, roster −64.5; LNS reaches HiGHS's optimum −36.5 after about 2.4 s of its own)
  if (lnsMs > 0 && !result.optimal && !signal?.aborted && result.score > -Infinity && now() < t0 + timeLimitMs - 50) {
    await improveByLns(compiled, result, t0 + timeLimitMs, now, t0, mapOptions, grid, signal);
  }
  // the whole call, compiling included
  result.timeMs = now() - t0;
  const decoded = decodeAssignment(compiled, result.assignment);
  return { status: 'solved', compiled, result, decoded, score: scoreRoster(roster, decoded.assignment), ideal: rosterIdeal(compiled), grid, dual };
}

/**
 * Round result.bound down to the score grid (still a proven bound: no roster scores between
 * grid points) and call the roster proven best once the rounded bound meets its score.
 */
function onGrid(result: MapResult, compiled: CompiledRoster, grid: number): boolean {
  if (!Number.isFinite(result.bound)) return false;
  result.bound = Math.max(result.score, roundToGrid(result.bound, compiled.model, grid));
  result.gap = relativeGap(result.score, result.bound);
  if (result.score > -Infinity && result.bound <= result.score + 1e-9) {
    result.optimal = true;
    result.stopReason = 'gap';
  }
  return result.optimal;
}

/**
 * Large-neighbourhood search from the search's roster until `deadline`, in slices so an abort or
 * the event loop is not kept waiting; result's roster, score and history follow each improvement.
 * Without HiGHS (it failed to load) the roster stays as it is.
 */
async function improveByLns(compiled: CompiledRoster, result: MapResult, deadline: number, now: () => number, t0: number, mapOptions: Partial<MapOptions>, grid: number, signal?: AbortSignal): Promise<void> {
  const highs = await loadHighsRuntime().catch(() => null);
  if (!highs) return;
  const x = Int32Array.from(result.assignment);
  const lns = createLns(compiled, highs, x, { seed: mapOptions.seed ?? 1 });
  let lastProgress = now();
  while (now() < deadline && !signal?.aborted && !result.optimal) {
    const before = lns.score;
    lns.run({ deadline: Math.min(deadline, now() + 100), now });
    if (lns.score > before) {
      result.assignment = Array.from(x);
      result.score = lns.score;
      result.timeToBestMs = now() - t0;
      result.gap = relativeGap(result.score, result.bound);
      onGrid(result, compiled, grid);
      result.history.push({ iteration: result.iterations + lns.stats.moves, timeMs: now() - t0, score: result.score, bound: result.bound });
      if (mapOptions.onProgress && now() - lastProgress >= (mapOptions.progressEveryMs ?? DEFAULT_MAP_OPTIONS.progressEveryMs)) {
        lastProgress = now();
        mapOptions.onProgress({ iteration: result.iterations + lns.stats.moves, timeMs: now() - t0, score: result.score, bound: result.bound, gap: result.gap });
      }
    }
    await tick();
  }
  if (lns.stats.moves) result.method = `${result.method}+lns`;
}

/**
 * The proof step (bound/prove-small.ts) for up to `budgetMs` (× `pace` wall ms each): HiGHS's roster when better, its
 * bound when lower; proven best when the rounded bound meets the score. True when HiGHS gave a bound.
 */
async function proveByMip(roster: Roster, compiled: CompiledRoster, result: MapResult, budgetMs: number, pace: number, now: () => number, t0: number, grid: number): Promise<boolean> {
  // under this HiGHS does not get through its root (12 × 2 weeks: 0.2 s from the optimum, warm)
  if (budgetMs < 150) return false;
  const proof = await proveSmall(roster, compiled, result, { timeLimitMs: budgetMs * pace, grid });
  if (!proof) return false;
  if (proof.improved) {
    result.assignment = proof.assignment;
    result.score = proof.score;
    result.timeToBestMs = now() - t0;
  }
  result.bound = Math.min(result.bound, proof.bound);
  result.gap = relativeGap(result.score, result.bound);
  onGrid(result, compiled, grid);
  result.method = `${result.method}+mip`;
  result.history.push({ iteration: result.iterations, timeMs: now() - t0, score: result.score, bound: result.bound });
  return Number.isFinite(proof.bound);
}

/**
 * Models with more factors than this go from the greedy start straight to LNS (when HiGHS loads and
 * lnsShare > 0). Measured (CPU, 2026-12-03): 60 people × 13 weeks (103,335 factors, most of them
 * the weekly rest's) — building the engine took 4.6 s and 580 MB and its local search then gained
 * 1 point in 3 s; 200 × 4 weeks (90,925) — 12.4 s and 1.05 GB, so a 10-s run took 31 s. The demo
 * (7,271) keeps the engine: its local search finds most of the early points there.
 */
const ENGINE_MAX_FACTORS = 30_000;

/**
 * The search's result when the engine is skipped: the start roster as it is, and as bound the ideal
 * (every factor at its own best: no roster scores more), which the Lagrangian then lowers.
 */
function startResult(compiled: CompiledRoster, x: Int32Array, timeMs: number): MapResult {
  const score = modelScore(compiled.model, x);
  const bound = Math.max(score, rosterIdeal(compiled).total);
  return {
    assignment: Array.from(x),
    score,
    bound,
    gap: relativeGap(score, bound),
    feasible: score > -Infinity,
    optimal: false,
    method: 'greedy',
    iterations: 0,
    timeMs,
    timeToBestMs: timeMs,
    stopReason: 'time',
    history: [{ iteration: 0, timeMs, score, bound }],
    beliefs: null,
  };
}

/** Rosters with at most this many seats give the bound 70 % of the time by default. */
const SMALL_ROSTER_SEATS = 120;

/**
 * Lower result.bound with the person-decomposition bound (bound/lagrangian-solver.ts), charged to
 * the call's own budget; result keeps its meaning (bound: proven upper bound rounded to the grid,
 * gap from it, the bound's history after the search's). Models outside the decomposition's
 * structure keep the MPLP bound.
 */
async function tightenWithLagrangian(
  compiled: CompiledRoster,
  result: MapResult,
  startedAt: number,
  timeLimitMs: number,
  now: () => number,
  mapOptions: Partial<MapOptions>,
  grid: number,
  dualStart: DualStart | undefined,
  signal?: AbortSignal,
): Promise<DualStart | undefined> {
  const report = mapOptions.onProgress;
  const bounded = await lagrangianSolver.solve(
    { compiled, incumbent: result },
    {
      startedAt,
      timeLimitMs,
      clock: now,
      dualStart,
      roundBound: (bound) => roundToGrid(bound, compiled.model, grid),
      absoluteTolerance: mapOptions.absoluteTolerance,
      progressEveryMs: mapOptions.progressEveryMs,
      onProgress: report && ((p) => report({ ...p, iteration: result.iterations + p.iteration })),
    },
    signal,
  );
  if (bounded.unsupported) return undefined;
  for (const point of bounded.history) result.history.push({ ...point, iteration: result.iterations + point.iteration });
  if (bounded.score > result.score) {
    result.assignment = bounded.assignment;
    result.score = bounded.score;
    result.feasible = true;
    result.timeToBestMs = bounded.timeToBestMs;
  }
  result.bound = bounded.bound;
  result.gap = bounded.gap;
  if (bounded.optimal) {
    result.optimal = true;
    result.stopReason = 'gap';
  }
  result.method = `${result.method}+${bounded.method}`;
  return bounded.dual;
}

const DAY_MS = 86_400_000;

/**
 * A start roster with every pin applied. A pinned person is taken off their other seats within a
 * day of the pinned shift (they could not keep both under the rest rules); the search refills
 * those. Without this a start that predates a pin cannot be encoded (a pinned seat allows only
 * its person) and is dropped.
 */
export function withPins(roster: Roster, start: RosterAssignment): RosterAssignment {
  const out = { ...start };
  const shiftStart = new Map(roster.shifts.map((s) => [s.id, Date.parse(`${s.start}Z`)]));
  const seatStart = new Map(roster.seats.map((s) => [s.id, shiftStart.get(s.shift) ?? 0]));
  for (const pin of roster.pins) {
    if (!(pin.seat in out)) continue;
    out[pin.seat] = pin.person;
    if (pin.person === null) continue;
    const at = seatStart.get(pin.seat)!;
    for (const seat of roster.seats)
      if (seat.id !== pin.seat && out[seat.id] === pin.person && Math.abs(seatStart.get(seat.id)! - at) < DAY_MS) out[seat.id] = null;
  }
  // A pin elsewhere may have moved someone onto a seat another pin gave them: pins win again.
  for (const pin of roster.pins) if (pin.seat in out) out[pin.seat] = pin.person;
  return out;
}
