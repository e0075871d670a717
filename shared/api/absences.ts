/**
 * Absences: approved time away (DESIGN.md). Staff request them from their phone
 * (`/api/me/absences`), coordinators enter, approve or decline them (`/api/absences`).
 * An approved absence makes the person unavailable in the roster model and credits hours
 * (shared/roster/schema.ts, `absences`).
 */
import { z } from 'zod';
import { localDateSchema, localTimeSchema, absenceKindSchema } from '../roster/schema';
import { versionField } from './paging';

export const ABSENCE_KINDS = absenceKindSchema.options;
export type AbsenceKindName = (typeof ABSENCE_KINDS)[number];
export const ABSENCE_KIND_WORDS: Record<AbsenceKindName, string> = {
  annual: 'Annual leave',
  sick: 'Sick leave',
  training: 'Training',
  parental: 'Parental leave',
  other: 'Other',
};
export type AbsenceStatus = 'requested' | 'approved' | 'declined';

const note = z.string().trim().max(500, 'At most 500 characters').nullable().optional();

/** Fields shared by coordinator and staff forms; `refineAbsence` checks their order. */
const absenceFields = {
  kind: absenceKindSchema,
  /** First day (local date, inclusive). */
  startDate: localDateSchema,
  /** Last day (local date, inclusive). */
  endDate: localDateSchema,
  /** Part day: the absence starts at this time on startDate (absent = the whole day). */
  startTime: localTimeSchema.nullable().optional(),
  /** Part day: the absence ends at this time on endDate (absent = the whole day). */
  endTime: localTimeSchema.nullable().optional(),
  /** Hours credited in total; absent or null = the workspace's default for the kind. */
  creditHours: z.number().min(0, 'Hours cannot be negative').max(5000).nullable().optional(),
  note,
};

type AbsenceShape = { startDate?: string; endDate?: string; startTime?: string | null; endTime?: string | null };
function refineAbsence(v: AbsenceShape, ctx: z.core.$RefinementCtx<AbsenceShape>): void {
  if (v.startDate && v.endDate) {
    if (v.endDate < v.startDate) ctx.addIssue({ code: 'custom', path: ['endDate'], message: 'The absence ends before it starts' });
    else if (v.endDate === v.startDate && v.startTime && v.endTime && v.endTime <= v.startTime)
      ctx.addIssue({ code: 'custom', path: ['endTime'], message: 'The absence ends before it starts' });
  }
}

export const createAbsenceBody = z.object({ personId: z.number().int().min(1), ...absenceFields }).superRefine(refineAbsence);
export const updateAbsenceBody = z
  .object({ personId: z.number().int().min(1), ...absenceFields })
  .partial()
  .extend({ version: versionField })
  .superRefine(refineAbsence);
export const requestAbsenceBody = z.object(absenceFields).superRefine(refineAbsence);
export const absenceDecisionBody = z.object({
  decision: z.enum(['approve', 'decline']),
  version: versionField,
  /** Sent to the person with a decline. */
  reason: note,
});
export const absencesListQuery = z.object({
  personId: z.coerce.number().int().min(1).optional(),
  status: z.enum(['requested', 'approved', 'declined']).optional(),
  /** Absences touching [from, to] (local dates). */
  from: localDateSchema.optional(),
  to: localDateSchema.optional(),
});

/** Credit per kind: "contracted" = the person's contracted daily hours (weekly ÷ 5) per working day absent; a number = hours per day; 0 = none. */
export const absenceCreditSchema = z.union([z.literal('contracted'), z.number().min(0).max(24)]);
export const absenceSettingsBody = z.object({
  credits: z.object(Object.fromEntries(ABSENCE_KINDS.map((k) => [k, absenceCreditSchema])) as Record<AbsenceKindName, typeof absenceCreditSchema>),
});
export type AbsenceSettings = z.output<typeof absenceSettingsBody>;
/** Common practice, no source: annual and parental leave credit contracted hours, sick leave and training likewise, other nothing. */
export const DEFAULT_ABSENCE_CREDITS: AbsenceSettings['credits'] = { annual: 'contracted', sick: 'contracted', training: 'contracted', parental: 'contracted', other: 0 };

export interface AbsenceDto {
  id: number;
  personId: number;
  personName: string;
  kind: AbsenceKindName;
  startDate: string;
  endDate: string;
  startTime: string | null;
  endTime: string | null;
  /** As entered; null = the workspace default for the kind. */
  creditHours: number | null;
  /** What the model counts: creditHours, or the default worked out for this person. */
  creditedHours: number;
  note: string | null;
  status: AbsenceStatus;
  requestedByName: string | null;
  decidedByName: string | null;
  decidedAt: string | null;
  declineReason: string | null;
  version: number;
  createdAt: string;
}

/** A published or solved roster seat an approved absence takes away. */
export interface AbsenceConflictDto {
  absenceId: number;
  personId: number;
  personName: string;
  rosterId: number;
  rosterName: string;
  seatId: number;
  shiftId: number;
  shiftLabel: string;
  /** Local date the shift starts on. */
  date: string;
  /** E.g. "Ines is on leave on 12 Mar; her late shift needs cover". */
  message: string;
}

// ---- CSV import: person, kind, start_date, end_date, start_time, end_time, credit_hours, note ----
export const ABSENCE_CSV_COLUMNS = ['person', 'kind', 'start_date', 'end_date', 'start_time', 'end_time', 'credit_hours', 'note'] as const;
export const ABSENCE_CSV_REQUIRED = ['person', 'kind', 'start_date', 'end_date'] as const;
export const absenceImportBody = z.object({
  csv: z.string().min(1, 'The file is empty').max(2 * 1024 * 1024, 'At most 2 MB'),
  /** false = preview only. */
  commit: z.boolean().default(false),
});
export interface AbsenceImportRow {
  /** Spreadsheet row: header is 1. */
  row: number;
  personName: string;
  personId: number | null;
  kind: string;
  startDate: string;
  endDate: string;
  errors: { column?: string; message: string }[];
}
export interface AbsenceImportReport {
  rows: AbsenceImportRow[];
  valid: number;
  invalid: number;
  canCommit: boolean;
  committed: boolean;
}

/** POST /api/absences/:id/decision answers the absence and whether the person was told by e-mail. */
export interface AbsenceDecisionDto extends AbsenceDto {
  /** to: null = the person has no e-mail address and no linked login, so no mail was sent. */
  mail: { to: string | null; sent: boolean; error?: string };
}

/** POST /api/rosters/:rosterId/absence-cover: how long the re-solve may take (as for any run). */
export const absenceCoverBody = z.object({
  timeLimitSeconds: z.number().min(0.5).max(600).default(10),
  seed: z.number().int().min(0).max(2 ** 31).default(1),
});
/** 202: the queued run (poll /api/runs/:runId) and the seats it is free to refill. */
export interface AbsenceCoverDto {
  runId: number;
  freedSeatIds: number[];
}
