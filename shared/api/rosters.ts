import { z } from 'zod';
import { localDateSchema, localDateTimeSchema, localTimeSchema, ruleSetSchema, timeZoneSchema, weekdaySchema, rosterAssignmentSchema } from '../roster/schema';
import { daysBetween } from '../roster/time';
import { listQuerySchema, versionField } from './paging';
import { lineText, noteText } from './text';
import { RULE_WORDS, TERM_WORDS } from '../../solver/roster/rules/catalogue-words';

const MAX_DAYS = 366;

const periodRefine = <T extends { periodStart?: string; periodEnd?: string }>(v: T, ctx: z.core.$RefinementCtx<T>) => {
  if (!v.periodStart || !v.periodEnd) return;
  // Zod runs object refinements even when a field failed; a date that is not a calendar date
  // ("2031-02-30", "abc") already has its own issue and must not reach daysBetween (it throws).
  if (!localDateSchema.safeParse(v.periodStart).success || !localDateSchema.safeParse(v.periodEnd).success) return;
  const days = daysBetween(v.periodStart, v.periodEnd) + 1;
  if (days < 1) ctx.addIssue({ code: 'custom', path: ['periodEnd'], message: 'The period ends before it starts' });
  else if (days > MAX_DAYS) ctx.addIssue({ code: 'custom', path: ['periodEnd'], message: `The period is ${days} days; at most ${MAX_DAYS}` });
};

const rosterFields = {
  name: lineText(120),
  periodStart: localDateSchema,
  periodEnd: localDateSchema,
  timeZone: timeZoneSchema,
  wishDeadline: z.iso.datetime({ offset: true }).nullable().optional(),
  maxCannotDays: z.number().int().min(0).max(366).nullable().optional(),
};
export const createRosterBody = z.object(rosterFields).superRefine(periodRefine);
export const updateRosterBody = z
  .object({ ...rosterFields, version: versionField })
  .partial()
  .required({ version: true })
  .superRefine(periodRefine);
export const rostersListQuery = listQuerySchema(['periodStart', 'name', 'createdAt'] as const, 'periodStart');

export const rosterIdParams = z.object({ rosterId: z.coerce.number().int().min(1) });
export const rosterChildParams = z.object({ rosterId: z.coerce.number().int().min(1), id: z.coerce.number().int().min(1) });

const seatSpec = z.object({ skillId: z.number().int().min(1).nullable().default(null), count: z.number().int().min(1).max(100) });
export const patternBody = z.object({
  label: lineText(60, 'Enter a label'),
  weekdays: z.array(weekdaySchema).min(1, 'Pick at least one weekday').max(7),
  startTime: localTimeSchema,
  endTime: localTimeSchema,
  seats: z.array(seatSpec).min(1, 'A shift needs at least one seat').max(50),
  night: z.boolean().nullable().optional(),
});

export const shiftBody = z
  .object({
    label: lineText(60, 'Enter a label'),
    startsLocal: localDateTimeSchema,
    endsLocal: localDateTimeSchema,
    night: z.boolean().nullable().optional(),
    seats: z.array(z.object({ skillId: z.number().int().min(1).nullable() })).min(1).max(100),
  })
  .superRefine((v, ctx) => {
    if (v.endsLocal <= v.startsLocal) ctx.addIssue({ code: 'custom', path: ['endsLocal'], message: 'The shift ends before it starts' });
  });
export const updateShiftBody = z
  .object({
    label: lineText(60, 'Enter a label').optional(),
    startsLocal: localDateTimeSchema.optional(),
    endsLocal: localDateTimeSchema.optional(),
    night: z.boolean().nullable().optional(),
    seats: z.array(z.object({ skillId: z.number().int().min(1).nullable() })).min(1).max(100).optional(),
    version: versionField,
  });

export const wishBody = z
  .object({
    personId: z.number().int().min(1),
    date: localDateSchema.optional(),
    shiftId: z.number().int().min(1).optional(),
    kind: z.enum(['prefer', 'avoid', 'cannot']),
    strength: z.number().min(0).max(1000).default(5),
    note: noteText(500).nullable().optional(),
  })
  .superRefine((v, ctx) => {
    if ((v.date === undefined) === (v.shiftId === undefined)) ctx.addIssue({ code: 'custom', path: ['date'], message: 'Give either a date or a shift' });
  });

/** A coordinator changes a wish in the wishes view (any person's, also after the staff deadline). */
export const updateWishBody = z
  .object({
    kind: z.enum(['prefer', 'avoid', 'cannot']).optional(),
    strength: z.number().min(0).max(1000).optional(),
    note: noteText(500).nullable().optional(),
  })
  .refine((v) => v.kind !== undefined || v.strength !== undefined || v.note !== undefined, { message: 'Nothing to change', path: ['kind'] });

/** One wish as the coordinator's wishes view shows it (server/rosters/wishes-view.ts). */
export interface CoordinatorWishDto {
  id: number;
  personId: number;
  date: string | null;
  shiftId: number | null;
  kind: 'prefer' | 'avoid' | 'cannot';
  strength: number;
  note: string | null;
  /** Who typed it (the person or a coordinator); null for seeded or imported wishes. */
  enteredByName: string | null;
  createdAt: string;
  updatedAt: string;
}
export interface WishesViewDto {
  items: CoordinatorWishDto[];
  /** People who have stated no wish for this roster yet. */
  silent: { personId: number; name: string; hasLogin: boolean }[];
}

export const pairingBody = z
  .object({
    personAId: z.number().int().min(1),
    personBId: z.number().int().min(1),
    score: z.number().min(-1000).max(1000).default(0),
    neverTogether: z.boolean().default(false),
    reason: noteText(500).nullable().optional(),
  })
  .superRefine((v, ctx) => {
    if (v.personAId === v.personBId) ctx.addIssue({ code: 'custom', path: ['personBId'], message: 'A person cannot be paired with themself' });
  });
export const updatePairingBody = z.object({
  score: z.number().min(-1000).max(1000).optional(),
  neverTogether: z.boolean().optional(),
  status: z.enum(['approved', 'requested', 'declined']).optional(),
  version: versionField,
});

export const rulesBody = z.object({ rules: ruleSetSchema, version: versionField });

export const pinBody = z.object({ seatId: z.number().int().min(1), personId: z.number().int().min(1).nullable() });

export const startRunBody = z.object({
  timeLimitSeconds: z.number().min(0.5).max(600).default(10),
  seed: z.number().int().min(0).max(2 ** 31).default(1),
});

/** A hand-edited roster: seat id → person id (null = open). */
export const scoreBody = z.object({ assignment: z.record(z.string().regex(/^\d+$/, 'seat ids are numbers'), z.number().int().min(1).nullable()) });

export { rosterAssignmentSchema };

// ---- issue 6: roster workflow (concessions, alternatives, manual saves, publish, exports) ----

export const runIdParams = z.object({ id: z.coerce.number().int().min(1, 'must be a positive id') });
export const seatAlternativesParams = z.object({ id: z.coerce.number().int().min(1), seatId: z.coerce.number().int().min(1) });

/** "What would it cost to honour this": one re-solve with the concession enforced, bounded in time. */
export const priceConcessionBody = z.object({ index: z.number({ error: 'name the concession by its number' }).int().min(0, 'concessions are numbered from 0'), timeLimitSeconds: z.number().min(0.5).max(30).default(5), seed: z.number().int().min(0).max(2 ** 31).default(1) });

/** A hand-edited roster saved as a "manual" run; `version` is the roster version the editor started from. */
export const manualRunBody = z.object({
  assignment: z.record(z.string().regex(/^\d+$/, 'seat ids are numbers'), z.number().int().min(1).nullable()),
  version: versionField,
  basedOnRunId: z.number().int().min(1).nullable().optional(),
});

export const publishBody = z.object({ runId: z.number().int().min(1, 'pick a finished run to publish'), version: versionField });
export const reopenBody = z.object({ version: versionField });

export const rosterExportQuery = z.object({
  runId: z.coerce.number().int().min(1).optional(),
  personId: z.coerce.number().int().min(1).optional(),
});

/** Plain names of the rules, per-person terms and score terms, for screens, e-mails and concession texts (rule and term names from the catalogue). */
export const TERM_LABELS: Record<string, string> = {
  ...Object.fromEntries(Object.entries(RULE_WORDS).map(([id, w]) => [id, w.name])),
  ...Object.fromEntries(Object.entries(TERM_WORDS).map(([kind, w]) => [kind, w.name])),
  absences: 'Time away',
  wishes: 'Wishes',
  pairings: 'Pairings',
  doubleBooking: 'No double booking',
  skills: 'Skills',
  pins: 'Pins',
  unknown: 'Unknown seat or person',
};

/** A roster as the API answers it (server/rosters/repository.ts toRosterDto). */
export interface RosterDto {
  id: number;
  name: string;
  periodStart: string;
  periodEnd: string;
  timeZone: string;
  status: 'draft' | 'solved' | 'published';
  wishDeadline: string | null;
  maxCannotDays: number | null;
  publishedAt: string | null;
  publishedRunId: number | null;
  version: number;
}

/** A dated shift with its seats, as the API answers it. */
export interface ShiftDto {
  id: number;
  patternId: number | null;
  label: string;
  startsLocal: string;
  endsLocal: string;
  night: boolean | null;
  seats: Array<{ id: number; skillId: number | null; position: number }>;
  version: number;
}
