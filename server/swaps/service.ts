import { Op } from 'sequelize';
import { Person } from '../db/models';
import { HttpError } from '../http/errors';
import { rosterIds } from '../rosters/ids';
import { Roster, SeatRow } from '../rosters/models';
import { notifyApprovedChange } from './approval-mail';
import { localDateTimeToInstant } from '../../shared/roster/time';
import type { ChangeCheck, SwapOptions, SwapProposal } from '../../shared/api/swaps';
import { checkChange } from './check';
import { swapDtos } from './dto';
import { SwapRow } from './models';
import { applyChange, assertFuture, assertPublished, publishedFilling, seatOnRoster, type Change } from './published';
import { publishedRosters, shiftsOfRun } from '../staff/shifts';

/**
 * Everything a proposal is checked for before anyone sees it: both seats on the same published
 * roster, not started, mine held by me and theirs by them, the colleague a person of this
 * workspace, and the changed roster keeping every hard rule.
 */
async function prepare(workspaceId: number, me: Person, body: SwapProposal) {
  const mine = await seatOnRoster(workspaceId, body.mySeatId, 'body.mySeatId');
  assertPublished(mine.roster, 'body.mySeatId');
  assertFuture(mine.shift, mine.roster.timeZone, 'body.mySeatId');
  if (body.colleagueId === me.id) throw new HttpError(422, 'unprocessable', 'Choose a colleague, not yourself.', [{ path: 'body.colleagueId', message: 'that is you' }]);
  const colleague = await Person.findOne({ where: { id: body.colleagueId, workspaceId, archivedAt: null } });
  if (!colleague) throw new HttpError(422, 'unprocessable', 'That colleague is not on this workspace’s team.', [{ path: 'body.colleagueId', message: 'no such person in this workspace' }]);
  const { json, assignment, runId } = await publishedFilling(workspaceId, mine.roster);
  const holder = (seatId: number) => assignment[rosterIds.seat(seatId)] ?? null;
  if (holder(body.mySeatId) !== rosterIds.person(me.id)) throw new HttpError(422, 'unprocessable', 'That shift is not yours on the published roster.', [{ path: 'body.mySeatId', message: 'not your shift' }]);
  let theirs: Awaited<ReturnType<typeof seatOnRoster>> | null = null;
  if (body.kind === 'swap') {
    theirs = await seatOnRoster(workspaceId, body.theirSeatId!, 'body.theirSeatId');
    if (theirs.roster.id !== mine.roster.id) throw new HttpError(422, 'unprocessable', 'Both shifts of a swap must be on the same roster.', [{ path: 'body.theirSeatId', message: 'on another roster' }]);
    assertFuture(theirs.shift, theirs.roster.timeZone, 'body.theirSeatId');
    if (holder(theirs.seat.id) !== rosterIds.person(colleague.id)) throw new HttpError(422, 'unprocessable', `That shift is not ${colleague.name}'s on the published roster.`, [{ path: 'body.theirSeatId', message: 'not the colleague’s shift' }]);
  }
  const change: Change = {
    expect: [
      { seatId: mine.seat.id, personId: me.id, field: 'body.mySeatId' },
      ...(theirs ? [{ seatId: theirs.seat.id, personId: colleague.id, field: 'body.theirSeatId' }] : []),
    ],
    moves: [
      { seatId: mine.seat.id, shiftId: mine.shift.id, from: me.id, to: colleague.id },
      ...(theirs ? [{ seatId: theirs.seat.id, shiftId: theirs.shift.id, from: colleague.id, to: me.id }] : []),
    ],
    reason: { kind: 'swap', id: 0 },
  };
  const check = checkChange(json, assignment, Object.fromEntries(change.moves.map((m) => [rosterIds.seat(m.seatId), rosterIds.person(m.to!)])));
  return { roster: mine.roster, colleague, theirs, check, baseRunId: runId };
}

/** The check alone, for the screen to show before proposing. */
export async function checkSwap(workspaceId: number, me: Person, body: SwapProposal): Promise<ChangeCheck> {
  return (await prepare(workspaceId, me, body)).check;
}

export async function proposeSwap(workspaceId: number, me: Person, body: SwapProposal) {
  const p = await prepare(workspaceId, me, body);
  if (!p.check.ok) {
    throw new HttpError(422, 'unprocessable', p.check.words[0], p.check.breaches.map((message) => ({ path: body.kind === 'swap' ? 'body.theirSeatId' : 'body.colleagueId', message })));
  }
  const row = await SwapRow.create({
    workspaceId,
    rosterId: p.roster.id,
    kind: body.kind,
    proposerPersonId: me.id,
    proposerSeatId: body.mySeatId,
    colleaguePersonId: p.colleague.id,
    colleagueSeatId: p.theirs?.seat.id ?? null,
    checkResult: p.check,
    baseRunId: p.baseRunId,
  });
  return (await swapDtos(workspaceId, [row]))[0];
}

export async function findSwap(workspaceId: number, id: number): Promise<SwapRow> {
  const row = await SwapRow.findOne({ where: { id, workspaceId } });
  if (!row) throw new HttpError(404, 'not_found', 'Swap not found', [{ path: 'params.id', message: 'no such swap in this workspace' }]);
  return row;
}

/** Moves a swap from one status to another only if it is still in `from` at the version the caller saw: of two at once, one wins. */
async function move(row: SwapRow, from: SwapRow['status'][], to: SwapRow['status'], version: number, extra: Partial<Pick<SwapRow, 'decidedAt' | 'decidedByUserId' | 'resultRunId' | 'checkResult'>> = {}, transaction?: import('sequelize').Transaction) {
  if (!from.includes(row.status)) throw new HttpError(409, 'conflict', `This swap is ${row.status} already.`, [{ path: 'params.id', message: `swap is ${row.status}` }]);
  const [count] = await SwapRow.update({ status: to, version: version + 1, ...extra }, { where: { id: row.id, workspaceId: row.workspaceId, version, status: from }, transaction });
  if (count === 0) throw new HttpError(409, 'conflict', 'Someone else acted on this swap first. Reload to see where it stands.', [{ path: 'body.version', message: `you saw version ${version}` }]);
}

/** The colleague agrees; the change is checked again against the roster as published now. */
export async function acceptSwap(workspaceId: number, me: Person, id: number, version: number) {
  const row = await findSwap(workspaceId, id);
  if (row.colleaguePersonId !== me.id) throw new HttpError(403, 'forbidden', 'Only the colleague asked can accept this swap.', [{ path: 'params.id', message: 'not asked of you' }]);
  const roster = (await Roster.findOne({ where: { id: row.rosterId, workspaceId } }))!;
  assertPublished(roster, 'params.id');
  const { json, assignment } = await publishedFilling(workspaceId, roster);
  const moves: Record<string, string> = { [rosterIds.seat(row.proposerSeatId)]: rosterIds.person(row.colleaguePersonId) };
  if (row.colleagueSeatId) moves[rosterIds.seat(row.colleagueSeatId)] = rosterIds.person(row.proposerPersonId);
  const check = checkChange(json, assignment, moves);
  if (!check.ok) throw new HttpError(422, 'unprocessable', check.words[0], check.breaches.map((message) => ({ path: 'params.id', message })));
  await move(row, ['proposed'], 'accepted', version, { checkResult: check });
  return (await swapDtos(workspaceId, [(await findSwap(workspaceId, id))]))[0];
}

export async function declineSwap(workspaceId: number, me: Person, id: number, version: number) {
  const row = await findSwap(workspaceId, id);
  if (row.colleaguePersonId !== me.id) throw new HttpError(403, 'forbidden', 'Only the colleague asked can decline this swap.', [{ path: 'params.id', message: 'not asked of you' }]);
  await move(row, ['proposed'], 'declined', version);
  return (await swapDtos(workspaceId, [(await findSwap(workspaceId, id))]))[0];
}

export async function withdrawSwap(workspaceId: number, me: Person, id: number, version: number) {
  const row = await findSwap(workspaceId, id);
  if (row.proposerPersonId !== me.id) throw new HttpError(403, 'forbidden', 'Only the person who proposed a swap can withdraw it.', [{ path: 'params.id', message: 'not yours' }]);
  await move(row, ['proposed', 'accepted'], 'withdrawn', version);
  return (await swapDtos(workspaceId, [(await findSwap(workspaceId, id))]))[0];
}

/** Swaps I proposed or was asked for, newest first. */
export async function mySwaps(workspaceId: number, me: Person) {
  const rows = await SwapRow.findAll({ where: { workspaceId, [Op.or]: [{ proposerPersonId: me.id }, { colleaguePersonId: me.id }] }, order: [['id', 'DESC']], limit: 200 });
  return { items: await swapDtos(workspaceId, rows) };
}

export async function listSwaps(workspaceId: number, status?: SwapRow['status']) {
  const rows = await SwapRow.findAll({ where: { workspaceId, ...(status ? { status } : {}) }, order: [['id', 'DESC']], limit: 200 });
  return { items: await swapDtos(workspaceId, rows) };
}

/**
 * The coordinator's one tap. Approving makes the change on the published roster (a new run,
 * the snapshot moved on, checked again under the roster's lock) and mails both people what
 * changed, in words of the swap or giveaway (approval-mail.ts).
 */
export async function decideSwap(workspaceId: number, userId: number, id: number, body: { decision: 'approve' | 'refuse'; version: number }) {
  const row = await findSwap(workspaceId, id);
  if (body.decision === 'refuse') {
    await move(row, ['proposed', 'accepted'], 'refused', body.version, { decidedAt: new Date(), decidedByUserId: userId });
    return { swap: (await swapDtos(workspaceId, [await findSwap(workspaceId, id)]))[0], mail: null };
  }
  if (row.status !== 'accepted') throw new HttpError(409, 'conflict', row.status === 'proposed' ? 'The colleague has not accepted this swap yet.' : `This swap is ${row.status} already.`, [{ path: 'params.id', message: `swap is ${row.status}` }]);
  const change: Change = {
    expect: [
      { seatId: row.proposerSeatId, personId: row.proposerPersonId, field: 'params.id' },
      ...(row.colleagueSeatId ? [{ seatId: row.colleagueSeatId, personId: row.colleaguePersonId, field: 'params.id' }] : []),
    ],
    moves: [],
    reason: { kind: 'swap', id: row.id },
  };
  const seats = await SeatRow.findAll({ where: { workspaceId, id: [row.proposerSeatId, ...(row.colleagueSeatId ? [row.colleagueSeatId] : [])] } });
  const shiftOf = new Map(seats.map((s) => [s.id, s.shiftId]));
  change.moves.push({ seatId: row.proposerSeatId, shiftId: shiftOf.get(row.proposerSeatId)!, from: row.proposerPersonId, to: row.colleaguePersonId });
  if (row.colleagueSeatId) change.moves.push({ seatId: row.colleagueSeatId, shiftId: shiftOf.get(row.colleagueSeatId)!, from: row.colleaguePersonId, to: row.proposerPersonId });
  const roster = (await Roster.findOne({ where: { id: row.rosterId, workspaceId } }))!;
  for (const m of change.moves) {
    const { shift } = await seatOnRoster(workspaceId, m.seatId, 'params.id');
    assertFuture(shift, roster.timeZone, 'params.id');
  }
  await applyChange(workspaceId, row.rosterId, change, async (transaction, result) => {
    await move(row, ['accepted'], 'approved', body.version, { decidedAt: new Date(), decidedByUserId: userId, resultRunId: result.runId, checkResult: result.check }, transaction);
  });
  const mail = await notifyApprovedChange(
    workspaceId,
    row.rosterId,
    row.kind === 'swap' && row.colleagueSeatId
      ? { kind: 'swap', proposerId: row.proposerPersonId, colleagueId: row.colleaguePersonId, proposerSeatId: row.proposerSeatId, colleagueSeatId: row.colleagueSeatId }
      : { kind: 'giveaway', proposerId: row.proposerPersonId, colleagueId: row.colleaguePersonId, proposerSeatId: row.proposerSeatId },
    userId,
  );
  return { swap: (await swapDtos(workspaceId, [await findSwap(workspaceId, id)]))[0], mail: { sent: mail.sent.length, noAddress: mail.noAddress.map((p) => p.name), failed: mail.failed.length } };
}

/** My future shifts on published rosters, and colleagues' future shifts on the same rosters. */
export async function swapOptions(workspaceId: number, me: Person, now = Date.now()): Promise<SwapOptions> {
  const rosters = (await publishedRosters(workspaceId)).filter((r) => r.status === 'published');
  const out: SwapOptions = { mine: [], colleagues: [] };
  const colleagues = new Map<number, SwapOptions['colleagues'][number]>();
  const people = await Person.findAll({ where: { workspaceId, archivedAt: null, id: { [Op.ne]: me.id } }, attributes: ['id', 'name'], order: [['name', 'ASC']] });
  for (const p of people) colleagues.set(p.id, { id: p.id, name: p.name, shifts: [] });
  for (const roster of rosters) {
    const byPerson = await shiftsOfRun(workspaceId, roster, roster.publishedRunId!, 'all');
    for (const [personId, shifts] of byPerson) {
      const future = shifts.filter((s) => localDateTimeToInstant(s.startsLocal, s.timeZone) > now);
      const refs = future.map((s) => ({ seatId: s.seatId, shiftId: s.shiftId, label: s.label, startsLocal: s.startsLocal, endsLocal: s.endsLocal, rosterId: roster.id }));
      if (personId === me.id) out.mine.push(...refs.map((r) => ({ ...r, rosterName: roster.name })));
      else colleagues.get(personId)?.shifts.push(...refs);
    }
  }
  out.colleagues = [...colleagues.values()];
  return out;
}
