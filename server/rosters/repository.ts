import { Op, UniqueConstraintError, type Transaction } from 'sequelize';
import { transactionWithRetry } from '../db/sequelize';
import { Person, Skill } from '../db/models';
import { HttpError, notFound } from '../http/errors';
import { updateVersioned } from '../http/versioned';
import { generateShifts } from '../../shared/roster/patterns';
import { ruleSetSchema, type RuleSet, type ShiftPattern } from '../../shared/roster/schema';
import type { Page } from '../../shared/api/paging';
import type { RosterDto, ShiftDto } from '../../shared/api/rosters';

export type { RosterDto, ShiftDto };
import { PinRow, Roster, SeatRow, ShiftPatternRow, ShiftRow, WishRow } from './models';
import { requireSeatRoom } from './seat-bounds';


export const toRosterDto = (r: Roster): RosterDto => ({
  id: r.id,
  name: r.name,
  periodStart: r.periodStart,
  periodEnd: r.periodEnd,
  timeZone: r.timeZone,
  status: r.status,
  wishDeadline: r.wishDeadline ? new Date(r.wishDeadline).toISOString() : null,
  maxCannotDays: r.maxCannotDays ?? null,
  publishedAt: r.publishedAt ? new Date(r.publishedAt).toISOString() : null,
  publishedRunId: r.publishedRunId ?? null,
  version: r.version,
});

/** The roster's status, or null when the workspace has no such roster (a cheap read for checks before a handler). */
export async function rosterStatus(workspaceId: number, id: number): Promise<Roster['status'] | null> {
  return (await Roster.findOne({ where: { id, workspaceId }, attributes: ['status'] }))?.status ?? null;
}

/** A 404 naming the path's roster id unless the workspace has that roster, so another workspace's id is a plain 404. */
export async function requireRoster(workspaceId: number, id: number): Promise<void> {
  if ((await rosterStatus(workspaceId, id)) === null) throw new HttpError(404, 'not_found', 'Roster not found', [{ path: 'params.rosterId', message: 'no such roster in this workspace' }]);
}

export async function findRoster(workspaceId: number, id: number): Promise<Roster> {
  const r = await Roster.findOne({ where: { id, workspaceId } });
  if (!r) throw notFound('Roster');
  return r;
}

export async function listRosters(workspaceId: number, q: { page: number; pageSize: number; sort: string; order: 'asc' | 'desc'; q?: string }): Promise<Page<RosterDto>> {
  const where = { workspaceId, ...(q.q ? { name: { [Op.like]: `%${q.q.replace(/[%_\\]/g, '\\$&')}%` } } : {}) };
  const { rows, count } = await Roster.findAndCountAll({ where, order: [[q.sort, q.order.toUpperCase()], ['id', 'ASC']], limit: q.pageSize, offset: (q.page - 1) * q.pageSize });
  return { items: rows.map(toRosterDto), total: count, page: q.page, pageSize: q.pageSize };
}

export async function createRoster(
  workspaceId: number,
  body: { name: string; periodStart: string; periodEnd: string; timeZone: string; wishDeadline?: string | null; maxCannotDays?: number | null },
): Promise<RosterDto> {
  const r = await Roster.create({
    workspaceId,
    name: body.name,
    periodStart: body.periodStart,
    periodEnd: body.periodEnd,
    timeZone: body.timeZone,
    rules: ruleSetSchema.parse({}),
    wishDeadline: body.wishDeadline ? new Date(body.wishDeadline) : null,
    maxCannotDays: body.maxCannotDays ?? null,
  });
  return toRosterDto(r);
}

export async function updateRoster(workspaceId: number, id: number, body: Record<string, unknown> & { version: number }): Promise<RosterDto> {
  const roster = await findRoster(workspaceId, id);
  if (roster.status === 'published' && (body.periodStart || body.periodEnd || body.timeZone)) {
    throw new HttpError(409, 'conflict', 'This roster is published; its period can no longer change', [{ path: 'body.periodStart', message: 'roster is published' }]);
  }
  const { version, ...rest } = body;
  const changes: Record<string, unknown> = { ...rest };
  if ('wishDeadline' in rest) changes.wishDeadline = rest.wishDeadline ? new Date(String(rest.wishDeadline)) : null;
  const start = (rest.periodStart as string | undefined) ?? roster.periodStart;
  const end = (rest.periodEnd as string | undefined) ?? roster.periodEnd;
  if (end < start) throw new HttpError(400, 'validation_failed', 'The period ends before it starts', [{ path: 'body.periodEnd', message: 'before the start' }]);
  await updateVersioned(Roster, { id, workspaceId }, version, changes, 'Roster');
  return toRosterDto(await findRoster(workspaceId, id));
}

export async function deleteRoster(workspaceId: number, id: number): Promise<void> {
  const count = await Roster.destroy({ where: { id, workspaceId } });
  if (count === 0) throw notFound('Roster');
}

/**
 * Every transaction that changes a roster's content takes the roster row's lock first. Child
 * inserts check their foreign key with a shared lock on the roster row, and touchRoster then
 * wants it exclusively: two such transactions deadlocked (8 simultaneous shift creates gave 6
 * × 500). Taking the exclusive lock first, always roster before children, orders them instead.
 */
export async function lockRoster(workspaceId: number, id: number, transaction: Transaction): Promise<Roster> {
  const r = await Roster.findOne({ where: { id, workspaceId }, transaction, lock: transaction.LOCK.UPDATE });
  if (!r) throw notFound('Roster');
  return r;
}

/** A content change of one roster: its row locked first, the whole transaction retried on a deadlock. */
export function changeRoster<T>(workspaceId: number, rosterId: number, fn: (t: Transaction, roster: Roster) => Promise<T>): Promise<T> {
  return transactionWithRetry(Roster.sequelize!, async (t) => fn(t, await lockRoster(workspaceId, rosterId, t)));
}

/** A roster's content changed (shifts, wishes, rules…): bump its version so a stale run or save is noticed. */
export async function touchRoster(workspaceId: number, id: number, transaction?: Transaction): Promise<void> {
  await Roster.increment('version', { where: { id, workspaceId }, transaction });
  await Roster.update({ status: 'draft' }, { where: { id, workspaceId, status: 'solved' }, transaction });
}

// ---- rules ----

export async function getRules(workspaceId: number, rosterId: number): Promise<{ rules: RuleSet; version: number }> {
  const r = await findRoster(workspaceId, rosterId);
  return { rules: ruleSetSchema.parse(r.rules ?? {}), version: r.version };
}

export async function putRules(workspaceId: number, rosterId: number, rules: RuleSet, version: number): Promise<{ rules: RuleSet; version: number }> {
  // New rules make the last result out of date, as any other roster edit does (touchRoster); the
  // version check makes the status read and the write one step.
  const roster = await findRoster(workspaceId, rosterId);
  await updateVersioned(Roster, { id: rosterId, workspaceId }, version, { rules, ...(roster.status === 'solved' ? { status: 'draft' } : {}) }, 'Roster');
  return getRules(workspaceId, rosterId);
}

// ---- shift patterns and shifts ----


export async function listShifts(workspaceId: number, rosterId: number): Promise<ShiftDto[]> {
  await findRoster(workspaceId, rosterId);
  const shifts = await ShiftRow.findAll({ where: { workspaceId, rosterId }, order: [['startsLocal', 'ASC'], ['id', 'ASC']] });
  const seats = await SeatRow.findAll({ where: { workspaceId, shiftId: shifts.map((s) => s.id) }, order: [['position', 'ASC']] });
  const byShift = new Map<number, ShiftDto['seats']>();
  for (const s of seats) {
    const list = byShift.get(s.shiftId) ?? [];
    list.push({ id: s.id, skillId: s.skillId ?? null, position: s.position });
    byShift.set(s.shiftId, list);
  }
  return shifts.map((s) => ({
    id: s.id,
    patternId: s.patternId ?? null,
    label: s.label,
    startsLocal: s.startsLocal,
    endsLocal: s.endsLocal,
    night: s.night ?? null,
    seats: byShift.get(s.id) ?? [],
    version: s.version,
  }));
}

type PatternBody = { label: string; weekdays: string[]; startTime: string; endTime: string; seats: Array<{ skillId: number | null; count: number }>; night?: boolean | null };

async function checkSkills(workspaceId: number, skillIds: Array<number | null>, path: (i: number) => string): Promise<void> {
  const ids = [...new Set(skillIds.filter((s): s is number => s !== null))];
  if (ids.length === 0) return;
  const known = new Set((await Skill.findAll({ where: { workspaceId, id: ids }, attributes: ['id'] })).map((s) => s.id));
  const bad = skillIds.findIndex((s) => s !== null && !known.has(s));
  if (bad >= 0) throw new HttpError(422, 'unprocessable', `Unknown skill id ${skillIds[bad]}`, [{ path: path(bad), message: 'unknown skill' }]);
}

/** The dated shifts a pattern makes over the roster's period (also used for the preview). */
export function expandPattern(roster: Pick<Roster, 'periodStart' | 'periodEnd' | 'timeZone'>, body: PatternBody) {
  const pattern: ShiftPattern = {
    label: body.label,
    weekdays: body.weekdays as ShiftPattern['weekdays'],
    start: body.startTime,
    end: body.endTime,
    seats: body.seats.map((s) => ({ skill: s.skillId === null ? null : String(s.skillId), count: s.count })),
    ...(body.night === null || body.night === undefined ? {} : { night: body.night }),
  };
  const { shifts, seats } = generateShifts([pattern], { start: roster.periodStart, end: roster.periodEnd, timeZone: roster.timeZone });
  return shifts.map((s) => ({
    label: s.patternLabel,
    startsLocal: s.start,
    endsLocal: s.end,
    night: s.night ?? null,
    seats: seats.filter((seat) => seat.shift === s.id).map((seat) => ({ skillId: seat.skill === null ? null : Number(seat.skill) })),
  }));
}

export async function previewPattern(workspaceId: number, rosterId: number, body: PatternBody) {
  const roster = await findRoster(workspaceId, rosterId);
  await checkSkills(workspaceId, body.seats.map((s) => s.skillId), (i) => `body.seats.${i}.skillId`);
  await requireSeatRoom(workspaceId, roster, body);
  return expandPattern(roster, body);
}

async function insertShifts(
  workspaceId: number,
  rosterId: number,
  patternId: number | null,
  shifts: Array<{ label: string; startsLocal: string; endsLocal: string; night: boolean | null; seats: Array<{ skillId: number | null }> }>,
  transaction: Transaction,
): Promise<number[]> {
  const created = await ShiftRow.bulkCreate(
    shifts.map((s) => ({ workspaceId, rosterId, patternId, label: s.label, startsLocal: s.startsLocal, endsLocal: s.endsLocal, night: s.night })),
    { transaction },
  );
  const seatRows = created.flatMap((row, i) => shifts[i].seats.map((seat, position) => ({ workspaceId, shiftId: row.id, skillId: seat.skillId, position })));
  await SeatRow.bulkCreate(seatRows, { transaction });
  return created.map((r) => r.id);
}

export async function createPattern(workspaceId: number, rosterId: number, body: PatternBody) {
  const roster = await findRoster(workspaceId, rosterId);
  await checkSkills(workspaceId, body.seats.map((s) => s.skillId), (i) => `body.seats.${i}.skillId`);
  const labelTaken = () => new HttpError(409, 'conflict', `This roster already has a pattern called "${body.label}"`, [{ path: 'body.label', message: 'already used' }]);
  return changeRoster(workspaceId, rosterId, async (transaction) => {
    const taken = await ShiftPatternRow.findOne({ where: { workspaceId, rosterId, label: body.label }, transaction });
    if (taken) throw labelTaken();
    await requireSeatRoom(workspaceId, roster, body, transaction);
    // The unique index (roster_id, label) is the last word should anything get past the lock.
    const pattern = await ShiftPatternRow.create(
      { workspaceId, rosterId, label: body.label, weekdays: body.weekdays, startTime: body.startTime, endTime: body.endTime, seats: body.seats, night: body.night ?? null },
      { transaction },
    ).catch((err: unknown) => {
      throw err instanceof UniqueConstraintError ? labelTaken() : err;
    });
    const ids = await insertShifts(workspaceId, rosterId, pattern.id, expandPattern(roster, body), transaction);
    await touchRoster(workspaceId, rosterId, transaction);
    return { id: pattern.id, ...body, shiftsCreated: ids.length };
  });
}

export async function listPatterns(workspaceId: number, rosterId: number) {
  await findRoster(workspaceId, rosterId);
  const rows = await ShiftPatternRow.findAll({ where: { workspaceId, rosterId }, order: [['startTime', 'ASC']] });
  return rows.map((p) => ({ id: p.id, label: p.label, weekdays: p.weekdays, startTime: p.startTime, endTime: p.endTime, seats: p.seats, night: p.night ?? null, version: p.version }));
}

export async function deletePattern(workspaceId: number, rosterId: number, id: number): Promise<void> {
  await changeRoster(workspaceId, rosterId, async (transaction) => {
    const pattern = await ShiftPatternRow.findOne({ where: { id, workspaceId, rosterId }, transaction });
    if (!pattern) throw notFound('Shift pattern');
    await ShiftRow.destroy({ where: { workspaceId, rosterId, patternId: id }, transaction });
    await pattern.destroy({ transaction });
    await touchRoster(workspaceId, rosterId, transaction);
  });
}

export async function createShift(workspaceId: number, rosterId: number, body: { label: string; startsLocal: string; endsLocal: string; night?: boolean | null; seats: Array<{ skillId: number | null }> }) {
  const roster = await findRoster(workspaceId, rosterId);
  checkInPeriod(roster, body.startsLocal);
  await checkSkills(workspaceId, body.seats.map((s) => s.skillId), (i) => `body.seats.${i}.skillId`);
  const [id] = await changeRoster(workspaceId, rosterId, async (transaction) => {
    const ids = await insertShifts(workspaceId, rosterId, null, [{ ...body, night: body.night ?? null }], transaction);
    await touchRoster(workspaceId, rosterId, transaction);
    return ids;
  });
  return (await listShifts(workspaceId, rosterId)).find((s) => s.id === id)!;
}

function checkInPeriod(roster: Roster, startsLocal: string): void {
  const day = startsLocal.slice(0, 10);
  if (day < roster.periodStart || day > roster.periodEnd) {
    throw new HttpError(422, 'unprocessable', `The shift starts on ${day}, outside the roster period ${roster.periodStart} to ${roster.periodEnd}`, [
      { path: 'body.startsLocal', message: 'outside the roster period' },
    ]);
  }
}

export async function updateShift(
  workspaceId: number,
  rosterId: number,
  id: number,
  body: { version: number; label?: string; startsLocal?: string; endsLocal?: string; night?: boolean | null; seats?: Array<{ skillId: number | null }> },
) {
  const roster = await findRoster(workspaceId, rosterId);
  const shift = await ShiftRow.findOne({ where: { id, workspaceId, rosterId } });
  if (!shift) throw notFound('Shift');
  const starts = body.startsLocal ?? shift.startsLocal;
  const ends = body.endsLocal ?? shift.endsLocal;
  if (ends <= starts) throw new HttpError(400, 'validation_failed', 'The shift ends before it starts', [{ path: 'body.endsLocal', message: 'before the start' }]);
  checkInPeriod(roster, starts);
  if (body.seats) await checkSkills(workspaceId, body.seats.map((s) => s.skillId), (i) => `body.seats.${i}.skillId`);
  await changeRoster(workspaceId, rosterId, async (transaction) => {
    const { version, seats, ...rest } = body;
    const [count] = await ShiftRow.update({ ...rest, version: version + 1 }, { where: { id, workspaceId, version }, transaction });
    if (count === 0) throw new HttpError(409, 'conflict', 'Someone else changed this shift while you were editing it. Reload to see their changes.', [{ path: 'body.version', message: `current version is ${shift.version}` }]);
    if (seats) {
      await SeatRow.destroy({ where: { shiftId: id, workspaceId }, transaction });
      await SeatRow.bulkCreate(seats.map((s, position) => ({ workspaceId, shiftId: id, skillId: s.skillId, position })), { transaction });
    }
    await touchRoster(workspaceId, rosterId, transaction);
  });
  return (await listShifts(workspaceId, rosterId)).find((s) => s.id === id)!;
}

export async function deleteShift(workspaceId: number, rosterId: number, id: number): Promise<void> {
  await changeRoster(workspaceId, rosterId, async (transaction) => {
    const count = await ShiftRow.destroy({ where: { id, workspaceId, rosterId }, transaction });
    if (count === 0) throw notFound('Shift');
    await touchRoster(workspaceId, rosterId, transaction);
  });
}

// ---- wishes ----

export async function listWishes(workspaceId: number, rosterId: number, personId?: number) {
  await findRoster(workspaceId, rosterId);
  const rows = await WishRow.findAll({ where: { workspaceId, rosterId, ...(personId ? { personId } : {}) }, order: [['id', 'ASC']] });
  return rows.map((w) => ({ id: w.id, personId: w.personId, date: w.date ?? null, shiftId: w.shiftId ?? null, kind: w.kind, strength: w.strength, note: w.note ?? null }));
}

export async function createWish(
  workspaceId: number,
  rosterId: number,
  body: { personId: number; date?: string; shiftId?: number; kind: 'prefer' | 'avoid' | 'cannot'; strength: number; note?: string | null },
  enteredByUserId: number | null = null,
) {
  const roster = await findRoster(workspaceId, rosterId);
  if (!(await Person.findOne({ where: { id: body.personId, workspaceId, archivedAt: null } }))) throw new HttpError(422, 'unprocessable', 'Unknown person', [{ path: 'body.personId', message: 'unknown person' }]);
  if (body.date && (body.date < roster.periodStart || body.date > roster.periodEnd)) {
    throw new HttpError(422, 'unprocessable', `${body.date} is outside the roster period`, [{ path: 'body.date', message: 'outside the roster period' }]);
  }
  if (body.shiftId && !(await ShiftRow.findOne({ where: { id: body.shiftId, workspaceId, rosterId } }))) {
    throw new HttpError(422, 'unprocessable', 'Unknown shift', [{ path: 'body.shiftId', message: 'not a shift of this roster' }]);
  }
  // the roster row first, as every content change: a bare version bump beside a running shift edit deadlocked
  const w = await changeRoster(workspaceId, rosterId, async (transaction) => {
    const row = await WishRow.create({ workspaceId, rosterId, personId: body.personId, date: body.date ?? null, shiftId: body.shiftId ?? null, kind: body.kind, strength: body.strength, note: body.note ?? null, enteredByUserId }, { transaction });
    await touchRoster(workspaceId, rosterId, transaction);
    return row;
  });
  return { id: w.id, personId: w.personId, date: w.date ?? null, shiftId: w.shiftId ?? null, kind: w.kind, strength: w.strength, note: w.note ?? null };
}

export async function deleteWish(workspaceId: number, rosterId: number, id: number): Promise<void> {
  await changeRoster(workspaceId, rosterId, async (transaction) => {
    const count = await WishRow.destroy({ where: { id, workspaceId, rosterId }, transaction });
    if (count === 0) throw notFound('Wish');
    await touchRoster(workspaceId, rosterId, transaction);
  });
}

// ---- pins ----

export async function listPins(workspaceId: number, rosterId: number) {
  await findRoster(workspaceId, rosterId);
  const rows = await PinRow.findAll({ where: { workspaceId, rosterId } });
  return rows.map((p) => ({ seatId: p.seatId, personId: p.personId ?? null }));
}

export async function putPin(workspaceId: number, rosterId: number, body: { seatId: number; personId: number | null }) {
  await findRoster(workspaceId, rosterId);
  const seat = await SeatRow.findOne({ where: { id: body.seatId, workspaceId } });
  const shift = seat ? await ShiftRow.findOne({ where: { id: seat.shiftId, rosterId, workspaceId } }) : null;
  if (!seat || !shift) throw new HttpError(422, 'unprocessable', 'Unknown seat', [{ path: 'body.seatId', message: 'not a seat of this roster' }]);
  if (body.personId !== null) {
    const person = await Person.findOne({ where: { id: body.personId, workspaceId, archivedAt: null } });
    if (!person) throw new HttpError(422, 'unprocessable', 'Unknown person', [{ path: 'body.personId', message: 'unknown person' }]);
    if (seat.skillId !== null && !(person.skills ?? []).includes(seat.skillId)) {
      throw new HttpError(422, 'unprocessable', `${person.name} lacks the skill this seat needs`, [{ path: 'body.personId', message: 'lacks the seat’s skill' }]);
    }
  }
  // Replace-or-create under the roster's lock: ten identical PUTs at once all answer 200 with one pin
  // (they gave 8 × 500 on the unique seat index when each deleted and inserted on its own).
  await changeRoster(workspaceId, rosterId, async (transaction) => {
    await PinRow.destroy({ where: { workspaceId, seatId: body.seatId }, transaction });
    await PinRow.create({ workspaceId, rosterId, seatId: body.seatId, personId: body.personId }, { transaction });
    await touchRoster(workspaceId, rosterId, transaction);
  });
  return body;
}

export async function deletePin(workspaceId: number, rosterId: number, seatId: number): Promise<void> {
  await changeRoster(workspaceId, rosterId, async (transaction) => {
    const count = await PinRow.destroy({ where: { workspaceId, rosterId, seatId }, transaction });
    if (count === 0) throw notFound('Pin');
    await touchRoster(workspaceId, rosterId, transaction);
  });
}
