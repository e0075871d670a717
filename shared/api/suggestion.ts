/**
 * Weight suggestions learned from a coordinator's edits (server/learning, solver/learn): the
 * request schemas and the answer shapes, shared by the API and the roster screen.
 */
import { z } from 'zod';

export const MIN_EDITS_FOR_SUGGESTION = 5;

export const suggestionDecisionBody = z.object({
  /** The suggestion being adopted or dismissed (the one the screen shows). */
  suggestionId: z.number().int().min(1),
});

export type WeightChange = { key: string; name: string; from: number; to: number };

export type PastRosterEffect = {
  rosterId: number;
  rosterName: string;
  edits: number;
  /** Of this roster's edits, how many the current / suggested weights score above what was proposed. */
  agreeBefore: number;
  agreeAfter: number;
  /** Re-solved under the suggested weights from the proposed roster: seats that would change, and rule counts that move. */
  seatsChanged: number | null;
  seats: number;
  moved: { key: string; name: string; before: number; after: number }[];
  note: string | null;
};

export type SuggestionReport = {
  /** "Your edits suggest: fair weekends 5 → 8, … (from 14 edits over 3 rosters)" */
  words: string;
  changes: WeightChange[];
  unchanged: string[];
  edits: number;
  rosters: number;
  agreeBefore: number;
  agreeAfter: number;
  skipped: number;
  /** Pairs of edits that undo each other, left out of the learning. */
  contradictions: string[];
  /** What to weigh before adopting (explains no more edits than now; lowers a rule on rest, hours or staffing). Absent on reports stored before it existed. */
  cautions?: string[];
  unexplained: string[];
  past: PastRosterEffect[];
  learner: { method: string; timeMs: number; oracleCalls: number; rounds: number; stopReason: string };
};

export type SuggestionDto = {
  id: number;
  rosterId: number;
  status: 'open' | 'adopted' | 'dismissed';
  weights: WeightChange[];
  report: SuggestionReport;
  editCount: number;
  rosterCount: number;
  createdAt: string;
  decidedAt: string | null;
  decidedBy: string | null;
};

export type SuggestionAnswer = {
  /** The roster's newest suggestion (open, or the last decided one), if any. */
  suggestion: SuggestionDto | null;
  /** Edits recorded in the workspace so far, and the minimum a suggestion needs. */
  edits: number;
  rosters: number;
  minEdits: number;
};

/** A seat alternative the coordinator picked (POST /api/rosters/:rosterId/preferences/alternative): recorded as a preference. */
export const pickedAlternativeBody = z.object({
  runId: z.number().int().min(1),
  seatId: z.number().int().min(1),
  /** The person picked for the seat; null to leave it open. */
  personId: z.number().int().min(1).nullable(),
});

export type PickedAlternativeAnswer = { preference: { id: number; seatsChanged: number } };
