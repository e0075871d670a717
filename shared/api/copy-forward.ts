import { z } from 'zod';
import { localDateSchema } from '../roster/schema';
import { lineText } from './text';
import type { RosterDto } from './rosters';

/** POST /api/rosters/:rosterId/copy-forward: a new roster from this one, its period moved to start on periodStart. */
export const copyForwardBody = z.object({ name: lineText(120), periodStart: localDateSchema }).strict();
export type CopyForwardInput = z.input<typeof copyForwardBody>;

export interface CopyForwardResult {
  roster: RosterDto;
  /** Days the period moved by (the new period is as long as the old one). */
  shiftedByDays: number;
  copied: { patterns: number; shiftsFromPatterns: number; handShifts: number; rules: true };
  /** Terms and pairings belong to people, not to one roster: these are the ones the new roster's period sees. */
  inForce: { peopleWithTerms: number; pairings: number };
  /** Never copied: wishes are for one period, absences are dated. */
  leftBehind: { wishes: number };
}
