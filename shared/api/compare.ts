/** Two runs of one roster side by side (issue 17): what changed between them, and what it did to the score. */
import { z } from 'zod';

export const compareQuery = z
  .object({
    a: z.coerce.number({ error: 'name the first run' }).int().min(1, 'must be a positive id'),
    b: z.coerce.number({ error: 'name the second run' }).int().min(1, 'must be a positive id'),
  })
  .refine((q) => q.a !== q.b, { path: ['b'], message: 'choose two different runs' });

export interface RunCompare {
  a: { runId: number; score: number; feasible: boolean };
  b: { runId: number; score: number; feasible: boolean };
  /** Seats whose holder differs: A's holder, then B's (null = open). */
  seats: Array<{ seatId: number; shiftId: number; label: string; startsLocal: string; endsLocal: string; a: { id: number; name: string } | null; b: { id: number; name: string } | null }>;
  people: Array<{ id: number; name: string; gained: number; lost: number }>;
  /** Soft points per score term (B − A), every term that moved. */
  terms: Array<{ term: string; label: string; a: number; b: number; change: number }>;
  /** Per person and term, the points of the penalties that name them (B − A). */
  personTerms: Array<{ id: number; name: string; term: string; label: string; change: number }>;
  /** Concessions (soft penalties given up) B has and A has not, and the other way. */
  concessionsAdded: Array<{ term: string; message: string; points: number }>;
  concessionsRemoved: Array<{ term: string; message: string; points: number }>;
}
