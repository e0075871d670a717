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
  /** Per person and score term, B − A: the penalties that name them, and their own wishes and pairings (gains too). */
  personTerms: Array<{ id: number; name: string; term: string; label: string; change: number }>;
  /**
   * Every per-person term (a rule for one person beside the roster-wide ones, DESIGN.md "term"),
   * in each run: honoured or not, units over (hard: shifts or counts breaking it) and points
   * (null for a hard term). `change` is B − A in points (null for a hard term).
   */
  personRuleTerms: Array<{
    id: number;
    name: string;
    /** Position among the person's terms (two terms of one kind are told apart by it). */
    index: number;
    kind: string;
    label: string;
    /** The term in words, e.g. "Always off on Wed (soft, 4 points a shift)". */
    words: string;
    hard: boolean;
    a: { honoured: boolean; units: number; points: number | null; breaches: string[] };
    b: { honoured: boolean; units: number; points: number | null; breaches: string[] };
    change: number | null;
  }>;
  /** Concessions (soft penalties given up) B has and A has not, and the other way. */
  concessionsAdded: Array<{ term: string; message: string; points: number }>;
  concessionsRemoved: Array<{ term: string; message: string; points: number }>;
}
