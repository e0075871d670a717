/**
 * Per-person terms (DESIGN.md "term"): rules for one person beside the roster-wide ones,
 * kept with an effective-from date and edited on the person's screen
 * (`/api/people/:id/terms`). A roster uses every term effective on or before its last day;
 * one effective after its first day covers the shifts from that date on (shared/roster/schema.ts
 * `termSchema`, `from`). To change a term from a date, edit it, or end it by deleting it.
 */
import { z } from 'zod';
import { localDateSchema, termSchema, type Term, type Weekday } from '../roster/schema';
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

const WEEKDAY_WORDS: Record<Weekday, string> = { mon: 'Mon', tue: 'Tue', wed: 'Wed', thu: 'Thu', fri: 'Fri', sat: 'Sat', sun: 'Sun' };
const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/** A term in a coordinator's words, e.g. "At most 4 nights (soft, 5 points each)". */
export function describeTerm(term: Term): string {
  const what = ((): string => {
    switch (term.kind) {
      case 'minHours':
        return `At least ${term.hours} h over the period`;
      case 'maxHours':
        return `At most ${term.hours} h over the period`;
      case 'noNights':
        return 'No night shifts';
      case 'maxNights':
        return `At most ${plural(term.count, 'night')}`;
      case 'maxWeekends':
        return `At most ${plural(term.count, 'weekend')} worked`;
      case 'daysOff':
        return `Always off on ${term.weekdays.map((d) => WEEKDAY_WORDS[d]).join(', ')}`;
      case 'maxShiftsPerWeek':
        return `At most ${plural(term.count, 'shift')} a week`;
      case 'earliestStart':
        return `No shift starting before ${term.time}`;
      case 'latestEnd':
        return `Every shift over by ${term.time}`;
      case 'allowedPatterns':
        return `Only ${term.labels.join(', ')} shifts`;
    }
  })();
  const unit = term.kind === 'minHours' || term.kind === 'maxHours' ? 'hour' : term.kind === 'maxNights' || term.kind === 'noNights' ? 'night' : term.kind === 'maxWeekends' ? 'weekend' : 'shift';
  return `${what} (${term.hard ? 'hard' : `soft, ${term.weight} point${term.weight === 1 ? '' : 's'} a ${unit}`})`;
}
