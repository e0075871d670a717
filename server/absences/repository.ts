import { Op, type Transaction } from 'sequelize';
import { Person, User } from '../db/models';
import { HttpError, notFound } from '../http/errors';
import { formatDay } from '../../shared/roster/derive';
import {
  ABSENCE_KIND_WORDS,
  DEFAULT_ABSENCE_CREDITS,
  type AbsenceDto,
  type AbsenceKindName,
  type AbsenceSettings,
  type AbsenceStatus,
} from '../../shared/api/absences';
import { AbsenceRow, AbsenceSettingsRow } from './models';
import { absenceSpan, creditedHours, spansOverlap, type AbsenceTimes } from './span';

// ---- settings ----

export async function absenceSettings(workspaceId: number, transaction?: Transaction): Promise<AbsenceSettings> {
  const row = await AbsenceSettingsRow.findOne({ where: { workspaceId }, transaction });
  // Kinds added after a workspace saved its settings fall back to the default for that kind.
  return { credits: { ...DEFAULT_ABSENCE_CREDITS, ...(row?.credits ?? {}) } };
}

export async function putAbsenceSettings(workspaceId: number, body: AbsenceSettings): Promise<AbsenceSettings> {
  const row = await AbsenceSettingsRow.findOne({ where: { workspaceId } });
  if (row) await AbsenceSettingsRow.update({ credits: body.credits, version: row.version + 1 }, { where: { id: row.id } });
  else {
    // Two first saves at once: the unique index lets one insert win; the other becomes an update.
    try {
      await AbsenceSettingsRow.create({ workspaceId, credits: body.credits });
    } catch (err) {
      if ((err as { name?: string }).name !== 'SequelizeUniqueConstraintError') throw err;
      await AbsenceSettingsRow.update({ credits: body.credits }, { where: { workspaceId } });
    }
  }
  return absenceSettings(workspaceId);
}

// ---- reading ----

const fmtRange = (a: AbsenceTimes) => {
  const from = `${formatDay(a.startDate)}${a.startTime ? ` ${a.startTime}` : ''}`;
  const to = `${formatDay(a.endDate)}${a.endTime ? ` ${a.endTime}` : ''}`;
  if (a.startDate === a.endDate) return `on ${formatDay(a.startDate)}${a.startTime || a.endTime ? ` ${a.startTime ?? '00:00'}–${a.endTime ?? '24:00'}` : ''}`;
  return `from ${from} to ${to}`;
};
export const describeAbsence = (a: AbsenceTimes & { kind: AbsenceKindName }) => `${ABSENCE_KIND_WORDS[a.kind].toLowerCase()} ${fmtRange(a)}`;

/** Rows → DTOs with names and credited hours; one query each for people, users and settings. */
export async function toAbsenceDtos(workspaceId: number, rows: AbsenceRow[]): Promise<AbsenceDto[]> {
  if (rows.length === 0) return [];
  const userIds = [...new Set(rows.flatMap((r) => [r.requestedByUserId, r.decidedByUserId]).filter((id): id is number => typeof id === 'number'))];
  const [people, users, settings] = await Promise.all([
    Person.findAll({ where: { workspaceId, id: [...new Set(rows.map((r) => r.personId))] }, attributes: ['id', 'name', 'contractedHours'] }),
    userIds.length ? User.findAll({ where: { id: userIds }, attributes: ['id', 'displayName'] }) : Promise.resolve([] as User[]),
    absenceSettings(workspaceId),
  ]);
  const person = new Map(people.map((p) => [p.id, p]));
  const userName = new Map(users.map((u) => [u.id, u.displayName]));
  return rows.map((r) => {
    const p = person.get(r.personId);
    return {
      id: r.id,
      personId: r.personId,
      personName: p?.name ?? '?',
      kind: r.kind,
      startDate: r.startDate,
      endDate: r.endDate,
      startTime: r.startTime ?? null,
      endTime: r.endTime ?? null,
      creditHours: r.creditHours ?? null,
      creditedHours: creditedHours(r, settings.credits[r.kind], p?.contractedHours ?? 0),
      note: r.note ?? null,
      status: r.status,
      requestedByName: r.requestedByUserId ? (userName.get(r.requestedByUserId) ?? null) : null,
      decidedByName: r.decidedByUserId ? (userName.get(r.decidedByUserId) ?? null) : null,
      decidedAt: r.decidedAt ? new Date(r.decidedAt).toISOString() : null,
      declineReason: r.declineReason ?? null,
      version: r.version,
      createdAt: new Date(r.createdAt).toISOString(),
    };
  });
}

export interface AbsenceFilter {
  personId?: number;
  status?: AbsenceStatus;
  from?: string;
  to?: string;
}

export async function listAbsences(workspaceId: number, f: AbsenceFilter = {}): Promise<AbsenceDto[]> {
  const rows = await AbsenceRow.findAll({
    where: {
      workspaceId,
      ...(f.personId ? { personId: f.personId } : {}),
      ...(f.status ? { status: f.status } : {}),
      // Touching [from, to]: starts on or before `to` and ends on or after `from`.
      ...(f.to ? { startDate: { [Op.lte]: f.to } } : {}),
      ...(f.from ? { endDate: { [Op.gte]: f.from } } : {}),
    },
    order: [['startDate', 'ASC'], ['id', 'ASC']],
  });
  return toAbsenceDtos(workspaceId, rows);
}

export async function absenceDto(workspaceId: number, id: number): Promise<AbsenceDto> {
  const row = await AbsenceRow.findOne({ where: { id, workspaceId } });
  if (!row) throw notFound('Absence');
  return (await toAbsenceDtos(workspaceId, [row]))[0];
}

// ---- writing ----

export interface AbsenceInput extends AbsenceTimes {
  personId: number;
  kind: AbsenceKindName;
  creditHours?: number | null;
  note?: string | null;
}

/**
 * Locks the people rows (in id order, so two requests cannot deadlock) for the rest of the
 * transaction: creates and edits of one person's absences then run one after the other, so two
 * overlapping requests at once cannot both pass the overlap check. A person of another workspace
 * is a 404 naming the field.
 */
export async function lockPeople(t: Transaction, workspaceId: number, personIds: number[], path = 'body.personId'): Promise<Map<number, Person>> {
  const ids = [...new Set(personIds)].sort((a, b) => a - b);
  const rows = await Person.findAll({ where: { workspaceId, id: ids }, order: [['id', 'ASC']], lock: t.LOCK.UPDATE, transaction: t });
  if (rows.length !== ids.length) {
    const missing = ids.find((id) => !rows.some((r) => r.id === id));
    throw new HttpError(404, 'not_found', 'Person not found in this workspace', [{ path, message: `no person ${missing} here` }]);
  }
  return new Map(rows.map((r) => [r.id, r]));
}

/** A span of no length (e.g. a single day ending at 00:00) would make no absence at all. */
export function assertSpan(a: AbsenceTimes, prefix = 'body'): void {
  const { start, end } = absenceSpan(a);
  if (end <= start) throw new HttpError(400, 'validation_failed', 'The absence ends before or when it starts', [{ path: `${prefix}.endTime`, message: 'ends before or when it starts' }]);
}

/**
 * Refuses an absence that overlaps another requested or approved one of the same person (declined
 * ones are history, not time away). Reads with a lock so it sees what a request that held the
 * person lock just committed.
 */
export async function assertNoOverlap(t: Transaction, workspaceId: number, person: Person, a: AbsenceTimes, exceptId?: number, path = 'body.startDate'): Promise<void> {
  const span = absenceSpan(a);
  const others = await AbsenceRow.findAll({
    where: {
      workspaceId,
      personId: person.id,
      status: { [Op.ne]: 'declined' },
      startDate: { [Op.lte]: a.endDate },
      endDate: { [Op.gte]: a.startDate },
      ...(exceptId ? { id: { [Op.ne]: exceptId } } : {}),
    },
    lock: t.LOCK.UPDATE,
    transaction: t,
  });
  const clash = others.find((o) => spansOverlap(span, absenceSpan(o)));
  if (clash) {
    throw new HttpError(409, 'conflict', `${person.name} already has ${describeAbsence(clash)} (${clash.status}); it overlaps this one. Change or remove that absence first.`, [
      { path, message: `overlaps absence ${clash.id} (${clash.startDate} to ${clash.endDate})` },
    ]);
  }
}

const transaction = <T>(fn: (t: Transaction) => Promise<T>) => AbsenceRow.sequelize!.transaction(fn);

export async function createAbsence(workspaceId: number, body: AbsenceInput, who: { userId: number; status: 'approved' | 'requested' }): Promise<AbsenceDto> {
  assertSpan(body);
  const id = await transaction(async (t) => {
    const person = (await lockPeople(t, workspaceId, [body.personId])).get(body.personId)!;
    await assertNoOverlap(t, workspaceId, person, body);
    const approved = who.status === 'approved';
    const row = await AbsenceRow.create(
      {
        workspaceId,
        personId: body.personId,
        kind: body.kind,
        startDate: body.startDate,
        endDate: body.endDate,
        startTime: body.startTime ?? null,
        endTime: body.endTime ?? null,
        creditHours: body.creditHours ?? null,
        note: body.note ?? null,
        status: who.status,
        requestedByUserId: who.userId,
        // A coordinator entering an absence approves it by doing so.
        decidedByUserId: approved ? who.userId : null,
        decidedAt: approved ? new Date() : null,
      },
      { transaction: t },
    );
    return row.id;
  });
  return absenceDto(workspaceId, id);
}

const staleVersion = (version: number, current: number) =>
  new HttpError(409, 'conflict', 'Someone else changed this absence while you were editing it. Reload to see their changes; yours are still on your screen.', [
    { path: 'body.version', message: `you edited version ${version}; the current one is ${current}` },
  ]);

/** Finds the row under lock inside `t`, checks the version the client saw, locks the person(s) concerned. */
async function lockAbsence(t: Transaction, workspaceId: number, id: number, version: number | null, newPersonId?: number) {
  const existing = await AbsenceRow.findOne({ where: { id, workspaceId }, transaction: t });
  if (!existing) throw notFound('Absence');
  // People first, then the absence row, in the same order as creates, so edits and creates cannot deadlock.
  const people = await lockPeople(t, workspaceId, [existing.personId, ...(newPersonId ? [newPersonId] : [])]);
  const row = (await AbsenceRow.findOne({ where: { id, workspaceId }, lock: t.LOCK.UPDATE, transaction: t }))!;
  if (version !== null && row.version !== version) throw staleVersion(version, row.version);
  return { row, people };
}

export async function updateAbsence(workspaceId: number, id: number, body: Partial<AbsenceInput> & { version: number }): Promise<AbsenceDto> {
  await transaction(async (t) => {
    const { row, people } = await lockAbsence(t, workspaceId, id, body.version, body.personId);
    const next = {
      personId: body.personId ?? row.personId,
      kind: body.kind ?? row.kind,
      startDate: body.startDate ?? row.startDate,
      endDate: body.endDate ?? row.endDate,
      startTime: body.startTime === undefined ? row.startTime : body.startTime,
      endTime: body.endTime === undefined ? row.endTime : body.endTime,
      creditHours: body.creditHours === undefined ? row.creditHours : body.creditHours,
      note: body.note === undefined ? row.note : body.note,
    };
    // The body alone may be in order while the merged result is not (a new end before the stored start).
    if (next.endDate < next.startDate) throw new HttpError(400, 'validation_failed', 'The absence ends before it starts', [{ path: 'body.endDate', message: `ends before it starts (${next.startDate})` }]);
    assertSpan(next);
    if (row.status !== 'declined') await assertNoOverlap(t, workspaceId, people.get(next.personId)!, next, row.id);
    await AbsenceRow.update({ ...next, version: row.version + 1 }, { where: { id, workspaceId }, transaction: t });
  });
  return absenceDto(workspaceId, id);
}

/** Approve or decline; re-approving a declined absence puts it back in the overlap check. */
export async function decideAbsence(workspaceId: number, id: number, body: { decision: 'approve' | 'decline'; version: number; reason?: string | null }, userId: number): Promise<{ dto: AbsenceDto; changed: boolean }> {
  const changed = await transaction(async (t) => {
    const { row, people } = await lockAbsence(t, workspaceId, id, body.version);
    const status = body.decision === 'approve' ? 'approved' : 'declined';
    if (status === 'approved' && row.status === 'declined') await assertNoOverlap(t, workspaceId, people.get(row.personId)!, row, row.id, 'body.decision');
    await AbsenceRow.update(
      { status, decidedByUserId: userId, decidedAt: new Date(), declineReason: status === 'declined' ? (body.reason ?? null) : null, version: row.version + 1 },
      { where: { id, workspaceId }, transaction: t },
    );
    return row.status !== status;
  });
  return { dto: await absenceDto(workspaceId, id), changed };
}

export async function deleteAbsence(workspaceId: number, id: number): Promise<void> {
  const count = await AbsenceRow.destroy({ where: { id, workspaceId } });
  if (count === 0) throw notFound('Absence');
}

// ---- staff: their own only ----

export async function myAbsences(workspaceId: number, personId: number): Promise<AbsenceDto[]> {
  return listAbsences(workspaceId, { personId });
}

/** A staff member withdraws their own request while no coordinator has decided it. */
export async function withdrawMyAbsence(workspaceId: number, personId: number, id: number): Promise<void> {
  const row = await AbsenceRow.findOne({ where: { id, workspaceId, personId } });
  if (!row) throw notFound('Absence');
  if (row.status !== 'requested') {
    throw new HttpError(409, 'conflict', `This absence has already been ${row.status}; ask a coordinator to change it.`, [{ path: 'params.id', message: `already ${row.status}` }]);
  }
  const count = await AbsenceRow.destroy({ where: { id, workspaceId, personId, status: 'requested' } });
  if (count === 0) throw new HttpError(409, 'conflict', 'A coordinator decided this request a moment ago; reload to see it.', [{ path: 'params.id', message: 'decided meanwhile' }]);
}
