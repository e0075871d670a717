/** Shapes of the roster and run API answers (server/rosters, server/runs), as the screens use them. */
import type { RuleSet } from '@/shared/roster/schema';
import type { RosterDto, ShiftDto } from '@/shared/api/rosters';

export type { RuleSet, RosterDto, ShiftDto };


export interface PatternDto {
  id: number;
  label: string;
  weekdays: string[];
  startTime: string;
  endTime: string;
  seats: Array<{ skillId: number | null; count: number }>;
  night: boolean | null;
  version: number;
}


export interface PreviewShift {
  label: string;
  startsLocal: string;
  endsLocal: string;
  night: boolean | null;
  seats: Array<{ skillId: number | null }>;
}

export interface Violation {
  term: string;
  hard: boolean;
  points: number | null;
  message: string;
  people: string[];
  seats: string[];
}

export interface PersonTotals {
  personId: string;
  name: string;
  shifts: number;
  hours: number;
  nights: number;
  weekendShifts: number;
  contractedHours?: number;
}

export interface RunDto {
  id: number;
  /** 1, 2, 3 … within the roster (server/runs/numbering.ts); the id is the database's. */
  number?: number;
  rosterId: number;
  status: 'queued' | 'running' | 'done' | 'failed' | 'cancelled';
  parameters: { timeLimitSeconds: number; seed: number; manual?: boolean; basedOnRunId?: number | null };
  progress: { iteration: number; score: number; bound: number; gap: number; elapsedMs: number } | null;
  score: number | null;
  bound: number | null;
  gap: number | null;
  rosterVersion: number;
  cancelRequested: boolean;
  startedAt: string | null;
  finishedAt: string | null;
  timeMs: number | null;
  error: string | null;
  createdAt: string;
}

export interface RunDetail extends RunDto {
  result: {
    feasible: boolean;
    optimal: boolean;
    /** Score with every rule, wish and pairing at its best (runs since concessions were measured). */
    ideal?: number | null;
    stopReason: string;
    method: string;
    openSeats: number;
    checkedScore: number | null;
    terms: Record<string, number>;
    violations: Violation[];
    violationCount: number;
    people: PersonTotals[];
    manual?: boolean;
  } | null;
  assignments: Array<{ seatId: number; personId: number | null; pinned: boolean }>;
}

export interface Concession extends Violation {
  index: number;
}

export interface ConcessionPrice {
  concession: { index: number; term: string; message: string; points: number | null };
  method: 'resolve-enforced';
  enforced: string;
  exact: boolean;
  feasible: boolean;
  baseScore: number | null;
  score: number | null;
  bound: number | null;
  price: number | null;
  changedSeats: number;
  timeMs: number;
  words: string;
}

/** Defined once in shared/api/seat-alternatives.ts. */
export type { SeatAlternativesAnswer as SeatAlternatives, SeatAlternative, SeatContestAnswer } from '@/shared/api/seat-alternatives';

export interface ScoreResult {
  total: number | null;
  feasible: boolean;
  softTotal: number;
  terms: Record<string, number>;
  hardCounts: Record<string, number>;
  violations: Array<Omit<Violation, 'seats'> & { seats: number[] }>;
}

export interface PublishResult {
  roster: RosterDto;
  mail: {
    sent: Array<{ personId: number; name: string; to: string }>;
    noAddress: Array<{ personId: number; name: string }>;
    failed: Array<{ personId: number; name: string; reason: string }>;
  };
}
