/**
 * The answer of GET /api/runs/:id/seats/:seatId/alternatives (server/runs/alternatives.ts),
 * one definition for server and client. Score changes are against the run's roster, in points
 * of the independent scorer; see docs/solver.md "Seat alternatives and how contested a seat is".
 */
export interface SeatAlternative {
  personId: number | null;
  name: string | null;
  /** False when the time ran out before this choice was tried (large rosters); only the bound is known then. */
  evaluated: boolean;
  /** A roster with this choice was found that keeps every hard rule. */
  feasible: boolean;
  /** Best roster found with this choice in the seat, minus the run's roster (the max-marginal when `exact`). */
  scoreChange: number | null;
  /** Upper bound on that change (the dual max-marginal bound); equals scoreChange when exact; null when unknown. */
  scoreChangeAtMost: number | null;
  exact: boolean;
  /** Seats other than this one that the roster behind scoreChange changes. */
  otherSeatsMoved: number;
  /** Those seats with their holders in that roster (what picking this choice keeps, server/learning records it). */
  otherSeats: Array<{ seatId: number; personId: number | null }>;
  /** Hard rules the best roster found with this choice breaks (when not feasible). */
  breaks: string[];
  /** Proven (exactly, or by the dual bound): no roster with this choice keeps every hard rule. */
  impossible: boolean;
}

export interface SeatContestAnswer {
  /** P(seat = its holder in the run) under p(roster) ∝ exp(score). */
  holderProbability: number;
  /** P(the holder is on any seat of this shift). */
  holderOnShiftProbability: number;
  others: Array<{ personId: number | null; name: string | null; probability: number }>;
  method: 'enumerate' | 'tree' | 'loopy-bethe';
  exact: boolean;
  converged: boolean;
}

export interface SeatAlternativesAnswer {
  runId: number;
  seatId: number;
  shift: { id: number; label: string; startsLocal: string; endsLocal: string; words: string };
  skill: string | null;
  current: { personId: number | null; name: string | null };
  pinned: { personId: number | null } | null;
  /** The run's roster scored now (with this seat's own pin lifted). */
  score: number | null;
  method: 'max-marginal';
  /** Every figure exact (enumeration or tree max-marginals). */
  exact: boolean;
  /** How the figures were found, in plain words. */
  methodWords: string;
  /** The methods by name (max-marginals, dual bound, sum-product), for a details line. */
  methodDetail: string;
  /** How contested the seat is, in words. */
  contested: string;
  contest: SeatContestAnswer | null;
  ignoredPins: number;
  ignoredPinsWords?: string;
  cached: boolean;
  timeMs: number;
  alternatives: SeatAlternative[];
}
