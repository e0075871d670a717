import { Op } from 'sequelize';
import { Person, Skill } from '../db/models';
import { HttpError } from '../http/errors';
import { rosterIds } from '../rosters/ids';
import { Roster, SeatRow, ShiftRow } from '../rosters/models';
import { notifyApprovedChange } from '../swaps/approval-mail';
import { localDateTimeToInstant } from '../../shared/roster/time';
import type { OpenSeatDto } from '../../shared/api/swaps';
import { checkChange } from '../swaps/check';
import { offerDtos } from '../swaps/dto';
import { OfferRow } from '../swaps/models';
import { applyChange, assertFuture, assertPublished, publishedFilling, seatOnRoster } from '../swaps/published';
import type { Roster as RosterJson, RosterAssignment } from '../../shared/roster/schema';

async function publishedRoster(workspaceId: number, rosterId: number): Promise<Roster> {
  const roster = await Roster.findOne({ where: { id: rosterId, workspaceId } });
  if (!roster) throw new HttpError(404, 'not_found', 'Roster not found', [{ path: 'params.rosterId', message: 'no such roster in this workspace' }]);
  assertPublished(roster, 'params.rosterId');
  return roster;
}

/**
 * Who could take `seat`, person by person: everyone active, each checked by putting them in the
 * seat and scoring the roster (scoreRoster), so skills, time away, rest, hours and every other
 * hard rule count. A person is eligible when that adds no hard-rule breach.
 */
function eligibility(json: RosterJson, assignment: RosterAssignment, seatKey: string, people: Person[]) {
  const eligible: Array<{ id: number; name: string }> = [];
  const ineligible: Array<{ id: number; name: string; reason: string }> = [];
  for (const p of people) {
    const key = rosterIds.person(p.id);
    if (!json.people.some((q) => q.id === key)) continue;
    const check = checkChange(json, assignment, { [seatKey]: key });
    if (check.ok) eligible.push({ id: p.id, name: p.name });
    else ineligible.push({ id: p.id, name: p.name, reason: check.breaches[0] });
  }
  return { eligible, ineligible };
}

const activePeople = (workspaceId: number) => Person.findAll({ where: { workspaceId, archivedAt: null }, attributes: ['id', 'name'], order: [['name', 'ASC']] });

/** The published roster's uncovered seats still to come, with who could take each. */
export async function openSeats(workspaceId: number, rosterId: number, now = Date.now()): Promise<{ items: OpenSeatDto[] }> {
  const roster = await publishedRoster(workspaceId, rosterId);
  const { json, assignment } = await publishedFilling(workspaceId, roster);
  const open = Object.entries(assignment).filter(([, p]) => p === null).map(([seat]) => Number(seat.slice(2)));
  if (open.length === 0) return { items: [] };
  const seats = await SeatRow.findAll({ where: { workspaceId, id: open } });
  const shifts = await ShiftRow.findAll({ where: { workspaceId, id: [...new Set(seats.map((s) => s.shiftId))] }, order: [['startsLocal', 'ASC']] });
  const skills = await Skill.findAll({ where: { workspaceId } });
  const offers = await OfferRow.findAll({ where: { workspaceId, rosterId, status: ['open', 'taken'] } });
  const people = await activePeople(workspaceId);
  const items: OpenSeatDto[] = [];
  for (const shift of shifts) {
    if (localDateTimeToInstant(shift.startsLocal, roster.timeZone) <= now) continue;
    for (const seat of seats.filter((s) => s.shiftId === shift.id).sort((a, b) => a.position - b.position)) {
      items.push({
        seatId: seat.id,
        shift: { seatId: seat.id, shiftId: shift.id, label: shift.label, startsLocal: shift.startsLocal, endsLocal: shift.endsLocal },
        skill: seat.skillId ? (skills.find((k) => k.id === seat.skillId)?.name ?? null) : null,
        ...eligibility(json, assignment, rosterIds.seat(seat.id), people),
        offerId: offers.find((o) => o.seatId === seat.id)?.id ?? null,
      });
    }
  }
  return { items };
}

/** Offers an open seat to everyone eligible, or to the named people, each of whom must be. */
export async function createOffer(workspaceId: number, userId: number, rosterId: number, body: { seatId: number; personIds?: number[] }) {
  const roster = await publishedRoster(workspaceId, rosterId);
  const { seat, shift, roster: seatRoster } = await seatOnRoster(workspaceId, body.seatId, 'body.seatId');
  if (seatRoster.id !== roster.id) throw new HttpError(422, 'unprocessable', 'That seat is on another roster.', [{ path: 'body.seatId', message: 'not a seat of this roster' }]);
  assertFuture(shift, roster.timeZone, 'body.seatId');
  const { json, assignment, runId } = await publishedFilling(workspaceId, roster);
  const seatKey = rosterIds.seat(seat.id);
  if (assignment[seatKey]) throw new HttpError(422, 'unprocessable', 'That seat is already filled on the published roster.', [{ path: 'body.seatId', message: 'seat is filled' }]);
  if (await OfferRow.count({ where: { workspaceId, seatId: seat.id, status: ['open', 'taken'] } })) {
    throw new HttpError(409, 'conflict', 'This seat is on offer already.', [{ path: 'body.seatId', message: 'already offered' }]);
  }
  const people = await activePeople(workspaceId);
  const { eligible, ineligible } = eligibility(json, assignment, seatKey, people);
  let to = eligible.map((p) => p.id);
  if (body.personIds) {
    const fields = body.personIds.flatMap((id, i) => {
      if (eligible.some((p) => p.id === id)) return [];
      const why = ineligible.find((p) => p.id === id);
      return [{ path: `body.personIds.${i}`, message: why ? `${why.name}: ${why.reason}` : 'no such person in this workspace' }];
    });
    if (fields.length) throw new HttpError(422, 'unprocessable', `Not everyone named can take this shift: ${fields.map((f) => f.message).join('; ')}`, fields);
    to = [...new Set(body.personIds)];
  }
  if (to.length === 0) throw new HttpError(422, 'unprocessable', 'Nobody can take this seat without breaking a hard rule.', [{ path: 'body.seatId', message: 'no one eligible' }]);
  const row = await OfferRow.create({ workspaceId, rosterId, seatId: seat.id, eligible: to, baseRunId: runId, createdByUserId: userId });
  return (await offerDtos(workspaceId, [row]))[0];
}

export async function findOffer(workspaceId: number, id: number): Promise<OfferRow> {
  const row = await OfferRow.findOne({ where: { id, workspaceId } });
  if (!row) throw new HttpError(404, 'not_found', 'Offer not found', [{ path: 'params.id', message: 'no such offer in this workspace' }]);
  return row;
}

const dto = async (workspaceId: number, id: number) => (await offerDtos(workspaceId, [await findOffer(workspaceId, id)]))[0];

/**
 * The first eligible person to take an open offer gets it (for the coordinator to approve): the
 * offer moves from open to taken in one conditional update, so of two takers at once one wins.
 * The taker is checked again against the roster as published now.
 */
export async function takeOffer(workspaceId: number, me: Person, id: number) {
  const row = await findOffer(workspaceId, id);
  if (!row.eligible.includes(me.id)) throw new HttpError(403, 'forbidden', 'This shift was not offered to you.', [{ path: 'params.id', message: 'not offered to you' }]);
  if (row.status !== 'open') throw new HttpError(409, 'conflict', row.status === 'taken' ? 'Someone else took this shift first.' : `This offer is ${row.status}.`, [{ path: 'params.id', message: `offer is ${row.status}` }]);
  const roster = (await Roster.findOne({ where: { id: row.rosterId, workspaceId } }))!;
  assertPublished(roster, 'params.id');
  const { json, assignment } = await publishedFilling(workspaceId, roster);
  const check = checkChange(json, assignment, { [rosterIds.seat(row.seatId)]: rosterIds.person(me.id) });
  if (!check.ok) throw new HttpError(422, 'unprocessable', check.words[0], check.breaches.map((message) => ({ path: 'params.id', message })));
  const [count] = await OfferRow.update(
    { status: 'taken', takerPersonId: me.id, takenAt: new Date(), checkResult: check, version: row.version + 1 },
    { where: { id, workspaceId, status: 'open' } },
  );
  if (count === 0) throw new HttpError(409, 'conflict', 'Someone else took this shift first.', [{ path: 'params.id', message: 'offer is taken' }]);
  return dto(workspaceId, id);
}

export async function myOffers(workspaceId: number, me: Person) {
  const rows = await OfferRow.findAll({ where: { workspaceId, status: { [Op.in]: ['open', 'taken', 'approved'] } }, order: [['id', 'DESC']], limit: 500 });
  const mine = rows.filter((r) => r.eligible.includes(me.id) && (r.status === 'open' || r.takerPersonId === me.id));
  return { items: await offerDtos(workspaceId, mine) };
}

export async function rosterOffers(workspaceId: number, rosterId: number) {
  // No published check: withdrawn and approved offers of a reopened roster stay readable.
  if (!(await Roster.count({ where: { id: rosterId, workspaceId } }))) throw new HttpError(404, 'not_found', 'Roster not found', [{ path: 'params.rosterId', message: 'no such roster in this workspace' }]);
  const rows = await OfferRow.findAll({ where: { workspaceId, rosterId }, order: [['id', 'DESC']], limit: 500 });
  return { items: await offerDtos(workspaceId, rows) };
}

async function move(row: OfferRow, from: OfferRow['status'][], to: OfferRow['status'], version: number, extra: Partial<Pick<OfferRow, 'decidedAt' | 'resultRunId' | 'checkResult'>> = {}, transaction?: import('sequelize').Transaction) {
  if (!from.includes(row.status)) throw new HttpError(409, 'conflict', `This offer is ${row.status}.`, [{ path: 'params.id', message: `offer is ${row.status}` }]);
  const [count] = await OfferRow.update({ status: to, version: version + 1, ...extra }, { where: { id: row.id, workspaceId: row.workspaceId, version, status: from }, transaction });
  if (count === 0) throw new HttpError(409, 'conflict', 'This offer changed since you loaded it. Reload to see where it stands.', [{ path: 'body.version', message: `you saw version ${version}` }]);
}

/** Approving puts the taker in the seat of the published roster (a new run, snapshot moved on) and mails them. */
export async function decideOffer(workspaceId: number, id: number, body: { decision: 'approve' | 'refuse'; version: number }) {
  const row = await findOffer(workspaceId, id);
  if (body.decision === 'refuse') {
    await move(row, ['taken'], 'refused', body.version, { decidedAt: new Date() });
    return { offer: await dto(workspaceId, id), mail: null };
  }
  if (row.status !== 'taken' || !row.takerPersonId) throw new HttpError(409, 'conflict', row.status === 'open' ? 'Nobody has taken this shift yet.' : `This offer is ${row.status}.`, [{ path: 'params.id', message: `offer is ${row.status}` }]);
  const { shift } = await seatOnRoster(workspaceId, row.seatId, 'params.id');
  const roster = (await Roster.findOne({ where: { id: row.rosterId, workspaceId } }))!;
  assertFuture(shift, roster.timeZone, 'params.id');
  await applyChange(
    workspaceId,
    row.rosterId,
    {
      expect: [{ seatId: row.seatId, personId: null, field: 'params.id' }],
      moves: [{ seatId: row.seatId, shiftId: shift.id, from: null, to: row.takerPersonId }],
      reason: { kind: 'offer', id: row.id },
    },
    async (transaction, result) => move(row, ['taken'], 'approved', body.version, { decidedAt: new Date(), resultRunId: result.runId, checkResult: result.check }, transaction),
  );
  const mail = await notifyApprovedChange(workspaceId, row.rosterId, { kind: 'offer', takerId: row.takerPersonId, seatId: row.seatId }, null);
  return { offer: await dto(workspaceId, id), mail: { sent: mail.sent.length, noAddress: mail.noAddress.map((p) => p.name), failed: mail.failed.length } };
}

export async function withdrawOffer(workspaceId: number, id: number, version: number) {
  const row = await findOffer(workspaceId, id);
  await move(row, ['open', 'taken'], 'withdrawn', version);
  return dto(workspaceId, id);
}
