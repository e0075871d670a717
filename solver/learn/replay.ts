/**
 * What other weights would have changed on a past roster: re-solve it under them (from the roster
 * that was proposed, with a time limit) and compare, seat by seat and rule by rule.
 */
import type { Roster, RosterAssignment } from '../../shared/roster/schema';
import { solveRoster } from '../roster/solve-roster';
import { makeFeaturizer, withWeights, type RuleSetLike } from './features';

export type ReplayResult =
  | { status: 'infeasible'; reasons: string[] }
  | {
      status: 'solved';
      assignment: RosterAssignment;
      /** Seats whose holder differs from the proposed roster's. */
      seatsChanged: string[];
      /** Violation units per learned rule: proposed roster, then the re-solved one (positive = more violations). */
      units: { key: string; before: number; after: number }[];
      /** Wish and pairing points of the two rosters (what staff asked for, as entered). */
      wishPoints: { before: number; after: number };
      timeMs: number;
    };

export async function replayWithWeights(
  roster: Roster,
  rules: RuleSetLike,
  keys: readonly string[],
  weights: readonly number[],
  proposed: RosterAssignment,
  options: { timeLimitMs: number; seed?: number },
  signal?: AbortSignal,
): Promise<ReplayResult> {
  const t0 = Date.now();
  const solved = await solveRoster({ ...roster, rules: withWeights(rules, keys, weights) as Roster['rules'] }, { timeLimitMs: options.timeLimitMs, seed: options.seed ?? 1, start: proposed, lagrangianShare: 0, lnsShare: 0 }, signal);
  if (solved.status !== 'solved') return { status: 'infeasible', reasons: solved.reasons };
  const y = solved.decoded.assignment;
  const f = makeFeaturizer(roster, rules, keys);
  const a = f(proposed);
  const b = f(y);
  return {
    status: 'solved',
    assignment: y,
    seatsChanged: roster.seats.map((s) => s.id).filter((s) => (y[s] ?? null) !== (proposed[s] ?? null)),
    units: keys.map((key, k) => ({ key, before: -a.rules[k], after: -b.rules[k] })),
    wishPoints: { before: a.offset, after: b.offset },
    timeMs: Date.now() - t0,
  };
}
