/**
 * One call from a validated roster to a solved, decoded and independently scored roster,
 * for the CLI and the server's run worker: pre-check (explainInfeasible), compile, solve from
 * the greedy start, decode, score with scoreRoster.
 */
import type { Roster, RosterAssignment } from '../../shared/roster/schema';
import { solveMap, type MapOptions, type MapResult } from '../inference';
import { DEFAULT_MAP_OPTIONS } from '../inference/options';
import { relativeGap, tick } from '../inference/solve';
import { buildLagrangian, lagrangianSteps, newLagrangianState } from './lagrangian';
import { score as modelScore } from '../model/score';
import { compileRoster, type CompiledRoster } from './compile';
import { decodeAssignment, encodeAssignment, type DecodedRoster } from './decode';
import { explainInfeasible } from './explain-infeasible';
import { greedyAssignment } from './greedy';
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
    };

export type SolveRosterOptions = Partial<MapOptions> & {
  start?: RosterAssignment;
  /**
   * The person-decomposition bound (lagrangian.ts): share of the time limit it gets after the
   * search (default 0.35); 0 turns it off. The reported bound is the lower of it and MPLP's, both
   * proven upper bounds.
   */
  lagrangianShare?: number;
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
  const compiled = compileRoster(roster);
  const { start, lagrangianShare = 0.35, ...mapOptions } = options;
  const timeLimitMs = mapOptions.timeLimitMs ?? DEFAULT_MAP_OPTIONS.timeLimitMs;
  let initial = greedyAssignment(compiled);
  if (start) {
    // The given roster (e.g. the previous run), with today's pins, wins unless greedy scores better:
    // a pin it does not follow, or a seat it cannot express, makes it lose.
    const enc = encodeAssignment(compiled, withPins(roster, start));
    if (enc.ok && modelScore(compiled.model, enc.values) >= modelScore(compiled.model, initial)) initial = enc.values;
  }
  const share = Math.min(0.9, Math.max(0, lagrangianShare));
  // compiling counts against the limit, but the search keeps a minimum (a short re-solve of a
  // large roster would otherwise get no search at all)
  const searchMs = Math.max(Math.min(200, timeLimitMs * (1 - share)), timeLimitMs * (1 - share) - (now() - t0));
  const result = await solveMap(compiled.model, { ...mapOptions, timeLimitMs: searchMs, initial: mapOptions.initial ?? initial }, signal);
  if (share > 0 && !result.optimal && !signal?.aborted) await tightenWithLagrangian(compiled, result, t0 + timeLimitMs, now, mapOptions, signal);
  // the whole call, compiling included
  result.timeMs = now() - t0;
  const decoded = decodeAssignment(compiled, result.assignment);
  return { status: 'solved', compiled, result, decoded, score: scoreRoster(roster, decoded.assignment) };
}

/**
 * Lower result.bound with the person-decomposition bound, in slices of ~50 ms so an abort or the
 * event loop is never kept waiting; result keeps its meaning (bound: proven upper bound, gap
 * from it). Models outside the decomposition's structure keep the MPLP bound.
 */
async function tightenWithLagrangian(
  compiled: CompiledRoster,
  result: MapResult,
  deadline: number,
  now: () => number,
  mapOptions: Partial<MapOptions>,
  signal?: AbortSignal,
): Promise<void> {
  const t0 = now();
  const S = buildLagrangian(compiled, { deadline, now });
  if ('unsupported' in S) return;
  const st = newLagrangianState(S);
  const target = result.score > -Infinity ? result.score : undefined;
  const startMs = result.timeMs - (now() - t0);
  let lastProgress = now();
  while (now() < deadline && !signal?.aborted) {
    lagrangianSteps(S, st, { deadline: Math.min(deadline, now() + 50), now, target });
    if (st.best < result.bound) {
      result.bound = Math.max(st.best, result.score);
      result.gap = relativeGap(result.score, result.bound);
      result.history.push({ iteration: result.iterations + st.iterations, timeMs: startMs + (now() - t0), score: result.score, bound: result.bound });
      if (mapOptions.onProgress && now() - lastProgress >= (mapOptions.progressEveryMs ?? DEFAULT_MAP_OPTIONS.progressEveryMs)) {
        lastProgress = now();
        mapOptions.onProgress({ iteration: result.iterations + st.iterations, timeMs: startMs + (now() - t0), score: result.score, bound: result.bound, gap: result.gap });
      }
    }
    if (result.score > -Infinity && result.bound - result.score <= (mapOptions.absoluteTolerance ?? DEFAULT_MAP_OPTIONS.absoluteTolerance)) {
      result.optimal = true;
      result.stopReason = 'gap';
      break;
    }
    await tick();
  }
  result.method = `${result.method}+lagrangian`;
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
