/** Score terms: every rule, every per-person term kind, and the parts that are not rules. */
import { RULE_NAMES, TERM_KINDS, type RuleName, type TermKind } from '../../shared/roster/schema';

export type TermName =
  | RuleName
  | TermKind
  /** Always hard: someone working a shift that overlaps their absence. */
  | 'absences'
  | 'wishes'
  | 'pairings'
  /** Always hard: a person on two overlapping shifts (or two seats of one shift). */
  | 'doubleBooking'
  /** Always hard: a person without the seat's skill. */
  | 'skills'
  /** Always hard: a pinned seat holding someone else. */
  | 'pins'
  /** Always hard: the filled roster names a seat or person the roster does not have. */
  | 'unknown';

export const TERM_NAMES: readonly TermName[] = [...RULE_NAMES, ...TERM_KINDS, 'absences', 'wishes', 'pairings', 'doubleBooking', 'skills', 'pins', 'unknown'];
