import { Op, type Transaction } from 'sequelize';
import { HttpError, notFound } from '../http/errors';
import { Roster, ShiftRow, WishRow } from '../rosters/models';
import { touchRoster } from '../rosters/repository';
import { addLocalDays, daysBetween, isoWeekday } from '../../shared/roster/time';
import type { MyRoster, MyWish, MyWishesAnswer, StaffWishKind } from '../../shared/api/staff';

/** Wishes a staff member states weigh the same as the coordinator's default (shared/api/rosters wishBody). */
const STAFF_WISH_STRENGTH = 5;
const WEEKDAYS = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'] as const;
const WEEKDAY_WORDS = ['Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday', 'Sunday'] as const;

export const isOpenForWishes = (r: Roster, now = Date.now()) =>
  (r.status === 'draft' || r.status === 'solved') && (!r.wishDeadline || new Date(r.wishDeadline).getTime() > now);

export const toMyRoster = (r: Roster, now = Date.now()): MyRoster => ({
  id: r.id,
  name: r.name,
  periodStart: r.periodStart,
  periodEnd: r.periodEnd,
  timeZone: r.timeZone,
  status: r.status,
  wishDeadline: r.wishDeadline ? new Date(r.wishDeadline).toISOString() : null,
  maxCannotDays: r.maxCannotDays ?? null,
  openForWishes: isOpenForWishes(r, now),
});

const toMyWish = (w: WishRow): MyWish => ({ id: w.id, date: w.date ?? null, shiftId: w.shiftId ?? null, kind: w.kind, note: w.note ?? null });

/**
 * Rosters a staff member may state wishes for (not yet published, period not over) and the
 * published ones. Only their name, period and wish settings: never runs or assignments.
 */
export async function myRosters(workspaceId: number, today: string): Promise<MyRoster[]> {
  const rows = await Roster.findAll({ where: { workspaceId, periodEnd: { [Op.gte]: today } }, order: [['periodStart', 'ASC'], ['id', 'ASC']] });
  return rows.map((r) => toMyRoster(r));
}

async function findRoster(workspaceId: number, rosterId: number, transaction?: Transaction, lock = false): Promise<Roster> {
  const r = await Roster.findOne({ where: { id: rosterId, workspaceId }, transaction, ...(lock ? { lock: transaction!.LOCK.UPDATE } : {}) });
  if (!r) throw notFound('Roster');
  return r;
}

/** Refuses any change once the roster is published or its wish deadline has passed. */
function assertOpen(r: Roster): void {
  if (r.status === 'published') {
    throw new HttpError(409, 'conflict', `${r.name} is published, so its wishes can no longer change`, [{ path: 'params.rosterId', message: 'roster is published' }]);
  }
  if (r.wishDeadline && new Date(r.wishDeadline).getTime() <= Date.now()) {
    const when = new Date(r.wishDeadline).toISOString().replace('T', ' ').slice(0, 16);
    // 403: the request is understood but the deadline forbids it; the field names the deadline
    throw new HttpError(403, 'forbidden', `Wishes for ${r.name} closed at ${when} UTC; they can be read but no longer changed. Ask your coordinator to enter a late wish.`, [
      { path: 'roster.wishDeadline', message: `the wish deadline was ${new Date(r.wishDeadline).toISOString()}` },
    ]);
  }
}

/** Distinct days a person has marked `cannot` (a shift wish counts on the day its shift starts). */
async function cannotDays(workspaceId: number, rosterId: number, personId: number, transaction?: Transaction): Promise<Set<string>> {
  const wishes = await WishRow.findAll({ where: { workspaceId, rosterId, personId, kind: 'cannot' }, transaction });
  const shiftIds = wishes.filter((w) => w.shiftId).map((w) => w.shiftId!);
  const shifts = shiftIds.length ? await ShiftRow.findAll({ where: { workspaceId, id: shiftIds }, attributes: ['id', 'startsLocal'], transaction }) : [];
  const dayOf = new Map(shifts.map((s) => [s.id, s.startsLocal.slice(0, 10)]));
  const days = new Set<string>();
  for (const w of wishes) {
    const day = w.date ?? (w.shiftId ? dayOf.get(w.shiftId) : undefined);
    if (day) days.add(day);
  }
  return days;
}

function assertWithinLimit(r: Roster, used: Set<string>, path: string): void {
  if (r.maxCannotDays === null || r.maxCannotDays === undefined) return;
  if (used.size > r.maxCannotDays) {
    throw new HttpError(
      422,
      'unprocessable',
      `${r.name} allows at most ${r.maxCannotDays} “cannot” day${r.maxCannotDays === 1 ? '' : 's'}; this would make ${used.size}. Mark some days “avoid” instead, or talk to your coordinator.`,
      [{ path, message: `at most ${r.maxCannotDays} cannot days` }],
    );
  }
}

export async function myWishes(workspaceId: number, rosterId: number, personId: number): Promise<MyWishesAnswer> {
  const roster = await findRoster(workspaceId, rosterId);
  const shifts = await ShiftRow.findAll({ where: { workspaceId, rosterId }, order: [['startsLocal', 'ASC'], ['id', 'ASC']], attributes: ['id', 'label', 'startsLocal', 'endsLocal'] });
  const wishes = await WishRow.findAll({ where: { workspaceId, rosterId, personId }, order: [['date', 'ASC'], ['id', 'ASC']] });
  return {
    roster: toMyRoster(roster),
    shifts: shifts.map((s) => ({ id: s.id, label: s.label, startsLocal: s.startsLocal, endsLocal: s.endsLocal })),
    wishes: wishes.map(toMyWish),
    cannotDaysUsed: (await cannotDays(workspaceId, rosterId, personId)).size,
  };
}

/** Sets the person's wish for one day or one shift, replacing what they had said about it. */
export async function setMyWish(
  workspaceId: number,
  rosterId: number,
  personId: number,
  body: { date?: string; shiftId?: number; kind: StaffWishKind; note?: string | null },
  enteredByUserId: number | null = null,
): Promise<{ wish: MyWish; created: boolean; cannotDaysUsed: number }> {
  return Roster.sequelize!.transaction(async (transaction) => {
    // The roster row lock serialises a person's concurrent taps, so the cannot limit holds.
    const roster = await findRoster(workspaceId, rosterId, transaction, true);
    assertOpen(roster);
    if (body.date && (body.date < roster.periodStart || body.date > roster.periodEnd)) {
      throw new HttpError(422, 'unprocessable', `${body.date} is outside ${roster.name} (${roster.periodStart} to ${roster.periodEnd})`, [{ path: 'body.date', message: 'outside the roster period' }]);
    }
    if (body.shiftId && !(await ShiftRow.findOne({ where: { id: body.shiftId, workspaceId, rosterId }, transaction }))) {
      throw new HttpError(422, 'unprocessable', 'That shift is not part of this roster', [{ path: 'body.shiftId', message: 'not a shift of this roster' }]);
    }
    const where = body.date ? { date: body.date, shiftId: null } : { shiftId: body.shiftId!, date: null };
    const existing = await WishRow.findOne({ where: { workspaceId, rosterId, personId, ...where }, transaction });
    const note = body.note?.trim() ? body.note.trim() : null;
    let row: WishRow;
    if (existing) {
      existing.kind = body.kind;
      existing.note = note;
      existing.enteredByUserId = enteredByUserId;
      row = await existing.save({ transaction });
    } else {
      row = await WishRow.create({ workspaceId, rosterId, personId, date: body.date ?? null, shiftId: body.shiftId ?? null, kind: body.kind, strength: STAFF_WISH_STRENGTH, note, enteredByUserId }, { transaction });
    }
    const used = await cannotDays(workspaceId, rosterId, personId, transaction);
    if (body.kind === 'cannot') assertWithinLimit(roster, used, 'body.kind');
    await touchRoster(workspaceId, rosterId, transaction);
    return { wish: toMyWish(row), created: !existing, cannotDaysUsed: used.size };
  });
}

/** "I can't do Tuesdays": the same wish on every such day of the period, all or nothing. */
export async function setWeeklyWish(
  workspaceId: number,
  rosterId: number,
  personId: number,
  body: { weekday: (typeof WEEKDAYS)[number]; shiftLabel?: string | null; kind: StaffWishKind; note?: string | null },
  enteredByUserId: number | null = null,
): Promise<{ wishes: MyWish[]; cannotDaysUsed: number }> {
  return Roster.sequelize!.transaction(async (transaction) => {
    const roster = await findRoster(workspaceId, rosterId, transaction, true);
    assertOpen(roster);
    const iso = WEEKDAYS.indexOf(body.weekday) + 1;
    if (body.shiftLabel) return weeklyShiftWish(roster, personId, iso, { ...body, shiftLabel: body.shiftLabel }, enteredByUserId, transaction);
    const dates: string[] = [];
    for (let i = 0; i <= daysBetween(roster.periodStart, roster.periodEnd); i++) {
      const day = addLocalDays(roster.periodStart, i);
      if (isoWeekday(day) === iso) dates.push(day);
    }
    return setWishesOn(roster, personId, dates.map((date) => ({ date, shiftId: null })), body, enteredByUserId, transaction);
  });
}

/** "Avoid Sunday nights": a wish on each shift of one kind (its label) that starts on the weekday. */
async function weeklyShiftWish(
  roster: Roster,
  personId: number,
  iso: number,
  body: { weekday: string; shiftLabel: string; kind: StaffWishKind; note?: string | null },
  enteredByUserId: number | null,
  transaction: Transaction,
): Promise<{ wishes: MyWish[]; cannotDaysUsed: number }> {
  const { workspaceId, id: rosterId } = roster;
  const labelled = await ShiftRow.findAll({ where: { workspaceId, rosterId, label: body.shiftLabel }, order: [['startsLocal', 'ASC'], ['id', 'ASC']], transaction });
  const shifts = labelled.filter((s) => isoWeekday(s.startsLocal.slice(0, 10)) === iso);
  if (shifts.length === 0) {
    const words = labelled.length ? `${roster.name} has “${body.shiftLabel}” shifts, but none starts on a ${WEEKDAY_WORDS[iso - 1]}.` : `${roster.name} has no shift called “${body.shiftLabel}”.`;
    throw new HttpError(422, 'unprocessable', words, [{ path: 'body.shiftLabel', message: labelled.length ? 'none on that weekday' : 'no such shift' }]);
  }
  return setWishesOn(roster, personId, shifts.map((s) => ({ date: null, shiftId: s.id })), body, enteredByUserId, transaction);
}

/** The same wish on each of several days or shifts, replacing what the person said about them; the cannot limit checked after. */
async function setWishesOn(
  roster: Roster,
  personId: number,
  targets: Array<{ date: string; shiftId: null } | { date: null; shiftId: number }>,
  body: { kind: StaffWishKind; note?: string | null },
  enteredByUserId: number | null,
  transaction: Transaction,
): Promise<{ wishes: MyWish[]; cannotDaysUsed: number }> {
  const { workspaceId, id: rosterId } = roster;
  const note = body.note?.trim() ? body.note.trim() : null;
  const byDay = targets.every((t) => t.date !== null);
  const existing = await WishRow.findAll({
    where: byDay ? { workspaceId, rosterId, personId, date: targets.map((t) => t.date!), shiftId: null } : { workspaceId, rosterId, personId, shiftId: targets.map((t) => t.shiftId!), date: null },
    transaction,
  });
  const keyOf = (t: { date: string | null; shiftId: number | null }) => (t.date ? `d${t.date}` : `s${t.shiftId}`);
  const known = new Map(existing.map((w) => [keyOf({ date: w.date ?? null, shiftId: w.shiftId ?? null }), w]));
  const rows: WishRow[] = [];
  for (const t of targets) {
    const w = known.get(keyOf(t));
    if (w) {
      w.kind = body.kind;
      w.note = note;
      w.enteredByUserId = enteredByUserId;
      rows.push(await w.save({ transaction }));
    } else {
      rows.push(await WishRow.create({ workspaceId, rosterId, personId, date: t.date, shiftId: t.shiftId, kind: body.kind, strength: STAFF_WISH_STRENGTH, note, enteredByUserId }, { transaction }));
    }
  }
  const used = await cannotDays(workspaceId, rosterId, personId, transaction);
  if (body.kind === 'cannot') assertWithinLimit(roster, used, 'body.kind');
  if (rows.length) await touchRoster(workspaceId, rosterId, transaction);
  return { wishes: rows.map(toMyWish), cannotDaysUsed: used.size };
}

export async function deleteMyWish(workspaceId: number, rosterId: number, personId: number, wishId: number): Promise<void> {
  await Roster.sequelize!.transaction(async (transaction) => {
    const roster = await findRoster(workspaceId, rosterId, transaction, true);
    // Someone else's wish is as unknown as a missing one.
    const wish = await WishRow.findOne({ where: { id: wishId, workspaceId, rosterId, personId }, transaction });
    if (!wish) throw notFound('Wish');
    assertOpen(roster);
    await wish.destroy({ transaction });
    await touchRoster(workspaceId, rosterId, transaction);
  });
}
