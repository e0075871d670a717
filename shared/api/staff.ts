import { z } from 'zod';
import { localDateSchema, weekdaySchema } from '../roster/schema';
import type { RosterDto } from './rosters';
import { lineText } from './text';

/**
 * Staff on their phones (issue 7): their own wishes, pairing requests and calendar feed. Every
 * endpoint acts for the person linked to the signed-in user; a `personId` naming anyone else is
 * refused, never silently swapped for the caller.
 */

export const wishKinds = ['prefer', 'avoid', 'cannot'] as const;
export type StaffWishKind = (typeof wishKinds)[number];

const note = z.string().trim().max(500, 'At most 500 characters').nullable().optional();

export const myWishBody = z
  .object({
    /** Only ever the caller's own person; sent by clients that want to be explicit. */
    personId: z.number().int().min(1).optional(),
    date: localDateSchema.optional(),
    shiftId: z.number().int().min(1).optional(),
    kind: z.enum(wishKinds, { error: 'Choose prefer, avoid or cannot' }),
    note,
  })
  .strict()
  .superRefine((v, ctx) => {
    if ((v.date === undefined) === (v.shiftId === undefined)) ctx.addIssue({ code: 'custom', path: ['date'], message: 'Give either a day or a shift' });
  });
export type MyWishInput = z.input<typeof myWishBody>;

/**
 * "I can't do Tuesdays": one wish on every such day of the period. With `shiftLabel` it is about
 * one kind of shift only ("avoid Sunday nights"): a wish on each shift of that label starting on
 * that weekday, the rest of the day left free.
 */
export const weeklyWishBody = z
  .object({
    personId: z.number().int().min(1).optional(),
    weekday: weekdaySchema,
    shiftLabel: lineText(60, 'Choose a kind of shift').nullable().optional(),
    kind: z.enum(wishKinds, { error: 'Choose prefer, avoid or cannot' }),
    note,
  })
  .strict();
export type WeeklyWishInput = z.input<typeof weeklyWishBody>;

export const pairingRequestBody = z
  .object({
    colleagueId: z.number({ error: 'Choose a colleague' }).int().min(1, 'Choose a colleague'),
    together: z.boolean({ error: 'Say whether you would like to work together or apart' }),
    reason: z.string({ error: 'Say why, in a sentence' }).trim().min(1, 'Say why, in a sentence').max(500, 'At most 500 characters'),
  })
  .strict();
export type PairingRequestInput = z.input<typeof pairingRequestBody>;

export const myShiftsQuery = z.object({
  /** Any day of the week whose hours to total; defaults to today in the workspace's time zone. */
  week: localDateSchema.optional(),
});

// ---- answers ----

export interface MyShift {
  seatId: number;
  shiftId: number;
  rosterId: number;
  rosterName: string;
  label: string;
  /** Wall-clock times in the roster's time zone. */
  startsLocal: string;
  endsLocal: string;
  /** The same instants in UTC (ISO 8601). */
  startsAt: string;
  endsAt: string;
  timeZone: string;
  hours: number;
  night: boolean | null;
  coworkers: string[];
}

export interface MyShiftsAnswer {
  person: { id: number; name: string; contractedHours: number };
  timeZone: string;
  today: string;
  shifts: MyShift[];
  week: { start: string; end: string; hours: number; contractedHours: number; shifts: number };
}

/** A roster as staff see it: the coordinator's roster answer without its plan details. */
export interface MyRoster extends Pick<RosterDto, 'id' | 'name' | 'periodStart' | 'periodEnd' | 'timeZone' | 'status' | 'wishDeadline' | 'maxCannotDays'> {
  /** Wishes can still be entered or changed. */
  openForWishes: boolean;
}

export interface MyWish {
  id: number;
  date: string | null;
  shiftId: number | null;
  kind: StaffWishKind;
  note: string | null;
}

export interface MyWishesAnswer {
  roster: MyRoster;
  /** Shift times only (no one's assignments), for wishes about one shift. */
  shifts: Array<{ id: number; label: string; startsLocal: string; endsLocal: string }>;
  wishes: MyWish[];
  cannotDaysUsed: number;
}

export interface MyPairingRequest {
  id: number;
  colleague: { id: number; name: string };
  together: boolean;
  status: 'requested' | 'approved' | 'declined';
  createdAt: string;
}

export interface MyFeedAnswer {
  active: boolean;
  createdAt: string | null;
  /** Only in the answer that made the address: the token is not stored, so it cannot be shown again. */
  url?: string;
}
