/**
 * The fairness ledger (issue 17; DESIGN.md "ledger"): per-person counts across published rosters,
 * the workspace's holiday calendar they count public holidays from, and the weights with which
 * the next roster's fairness reads them.
 */
import { z } from 'zod';
import { localDateSchema } from '../roster/schema';
import { versionField } from './paging';

export const ledgerQuery = z
  .object({ from: localDateSchema.optional(), to: localDateSchema.optional() })
  .refine((q) => !q.from || !q.to || q.from <= q.to, { path: ['to'], message: 'must be on or after from' });

/** "GB-ENG", "DE-BY", "FR": a country code, optionally a region of it, as date-holidays names them. */
export const holidayRegionSchema = z.string().regex(/^[A-Z]{2}(-[A-Za-z0-9]{1,6})?$/, 'a country code such as GB or GB-ENG');

export const ledgerSettingsBody = z.object({
  region: holidayRegionSchema.nullable(),
  nightWeight: z.number().min(0, 'cannot be negative').max(1000),
  weekendWeight: z.number().min(0, 'cannot be negative').max(1000),
  lookbackDays: z.number().int().min(7, 'at least a week').max(366, 'at most a year'),
  version: versionField,
});

export const holidayBody = z.object({
  date: localDateSchema,
  name: z.string().trim().min(1, 'name the day').max(120).regex(/^[^\p{Cc}\u2028\u2029]*$/u, 'no control characters'),
});

export const holidayDateParams = z.object({ date: localDateSchema });

export interface LedgerCounts {
  shifts: number;
  hours: number;
  nights: number;
  weekendShifts: number;
  /** Weekends with at least one shift (Saturday or Sunday start), counted per period: a weekend split by two periods counts in each. */
  weekendsWorked: number;
  holidayShifts: number;
  unpopularShifts: number;
  wishesHonoured: number;
  wishesRefused: number;
  /** Contracted hours over the same days (0 without a contract). */
  contractHours: number;
  swaps: number;
}

export interface LedgerPeriod {
  rosterId: number;
  name: string;
  start: string;
  end: string;
}

export interface LedgerAnswer {
  from: string | null;
  to: string | null;
  holidays: Array<{ date: string; name: string; source: 'entered' | 'region' }>;
  periods: LedgerPeriod[];
  people: Array<{ personId: number; name: string; totals: LedgerCounts; byPeriod: Array<{ rosterId: number } & LedgerCounts> }>;
  team: { totals: LedgerCounts; byPeriod: Array<{ rosterId: number } & LedgerCounts> };
}

export interface LedgerSettingsDto {
  region: string | null;
  nightWeight: number;
  weekendWeight: number;
  lookbackDays: number;
  version: number;
  holidays: Array<{ date: string; name: string; source: 'entered' | 'region'; id?: number }>;
}

/**
 * A team figure is shown only when at least this many colleagues besides the person asking were
 * counted in it: with one, the team's sum less your own would be that colleague's counts.
 */
export const MIN_COLLEAGUES = 2;

/** A staff member's own ledger (GET /api/me/ledger): their line and the team's per-person averages, no one else's line. */
export interface MyLedgerAnswer {
  from: string | null;
  to: string | null;
  holidays: Array<{ date: string; name: string; source: 'entered' | 'region' }>;
  /** Every published roster meeting the range, counted over its whole period. */
  periods: LedgerPeriod[];
  me: { personId: number; name: string; totals: LedgerCounts; byPeriod: Array<{ rosterId: number } & LedgerCounts> } | null;
  /** People the ledger counted over these periods, you included. */
  teamSize: number;
  minColleagues: number;
  team: {
    /** Per period: how many people were counted (you included) and their average, null when too few colleagues. */
    byPeriod: Array<{ rosterId: number; people: number; average: LedgerCounts | null }>;
    /** The periods whose average is shown; the two lines below cover exactly these. */
    rosterIds: number[];
    /** The sum of those periods' averages: a colleague counted in every one of them. */
    average: LedgerCounts;
    /** Your own counts over the same periods (zeros for a period you were not counted in). */
    mine: LedgerCounts;
  };
}
