/**
 * One call from a validated roster to a solved, decoded and independently scored roster,
 * for the CLI and the server's run worker: pre-check (explainInfeasible), compile, solve from
 * the greedy start, decode, score with scoreRoster.
 */
import type { Roster, RosterAssignment } from '../../shared/roster/schema';
import { solveMap, type MapOptions, type MapResult } from '../inference';
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

/**
 * Solve a roster. `start`, when given, is a filled roster to start from (e.g. the published
 * one, or a coordinator's edit); seats it cannot express (someone no longer eligible) fall
 * back to the greedy start, as does a start that scores below it. Other MapOptions pass through (time limit, seed, onProgress…).
 */
export async function solveRoster(
  roster: Roster,
  options: Partial<MapOptions> & { start?: RosterAssignment } = {},
  signal?: AbortSignal,
): Promise<SolveRosterResult> {
  const reasons = explainInfeasible(roster);
  if (reasons.length) return { status: 'infeasible', reasons };
  const compiled = compileRoster(roster);
  const { start, ...mapOptions } = options;
  let initial = greedyAssignment(compiled);
  if (start) {
    // The given roster (e.g. the previous run with today's pins) wins unless greedy scores better:
    // a pin it does not follow, or a seat it cannot express, makes it lose.
    const enc = encodeAssignment(compiled, start);
    if (enc.ok && modelScore(compiled.model, enc.values) >= modelScore(compiled.model, initial)) initial = enc.values;
  }
  const result = await solveMap(compiled.model, { ...mapOptions, initial: mapOptions.initial ?? initial }, signal);
  const decoded = decodeAssignment(compiled, result.assignment);
  return { status: 'solved', compiled, result, decoded, score: scoreRoster(roster, decoded.assignment) };
}
