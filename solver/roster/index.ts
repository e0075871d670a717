/** Roster ↔ model: compile, decode, score independently, explain infeasibility. */
export { compileRoster, modelTerms, termOf, OPEN } from './compile';
export type { CompiledRoster } from './compile';
export { decodeAssignment, encodeAssignment } from './decode';
export type { DecodedRoster, DecodedSeat, PersonSummary } from './decode';
export { scoreRoster, makeRosterScorer, TERM_NAMES } from './score-roster';
export type { RosterScore, RosterViolation, TermName } from './score-roster';
export { explainInfeasible } from './explain-infeasible';
export { greedyAssignment } from './greedy';
export { solveRoster } from './solve-roster';
export type { SolveRosterResult } from './solve-roster';
export { expandCountingForUai } from './uai-expand';
