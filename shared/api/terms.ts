/**
 * Per-person terms (DESIGN.md "term"): rules for one person beside the roster-wide ones,
 * kept with an effective-from date and edited on the person's screen
 * (`/api/people/:id/terms`). A roster uses, per kind, the latest term effective on or before
 * its last day; one effective after the first day covers shifts from that date
 * (shared/roster/schema.ts `termSchema`, `from`).
 */
import { z } from 'zod';
import { localDateSchema, termSchema, type Term } from '../roster/schema';
import { versionField } from './paging';

export const createTermBody = z.object({ term: termSchema, effectiveFrom: localDateSchema });
export const updateTermBody = z.object({ term: termSchema.optional(), effectiveFrom: localDateSchema.optional(), version: versionField });
export const termParams = z.object({ id: z.coerce.number().int().min(1), termId: z.coerce.number().int().min(1) });

export interface TermDto {
  id: number;
  personId: number;
  /** The term without `from` (the roster sets it from effectiveFrom). */
  term: Term;
  effectiveFrom: string;
  /** In words, e.g. "No night shifts (hard)". */
  words: string;
  version: number;
  createdAt: string;
}
