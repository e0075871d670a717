import { Op, UniqueConstraintError } from 'sequelize';
import { Person } from '../db/models';
import { HttpError, notFound } from '../http/errors';
import type { MyPairingRequest } from '../../shared/api/staff';
import { PairingRow } from '../rosters/models';

/**
 * A suggested score for the coordinator to confirm or change; requests never reach the solver
 * until approved (server/rosters/assemble.ts reads approved pairings only).
 */
const SUGGESTED_SCORE = 5;

/** Colleagues to pick from: names only. */
export async function colleagues(workspaceId: number, personId: number): Promise<Array<{ id: number; name: string }>> {
  const rows = await Person.findAll({ where: { workspaceId, id: { [Op.ne]: personId }, archivedAt: null }, attributes: ['id', 'name'], order: [['name', 'ASC']] });
  return rows.map((p) => ({ id: p.id, name: p.name }));
}

/** The staff member's own requests: colleague, direction and status. Never the score, never others' requests. */
export async function myPairingRequests(workspaceId: number, personId: number): Promise<MyPairingRequest[]> {
  const rows = await PairingRow.findAll({ where: { workspaceId, requestedByPersonId: personId }, order: [['id', 'DESC']] });
  const others = rows.map((r) => (r.personAId === personId ? r.personBId : r.personAId));
  const names = new Map((await Person.findAll({ where: { workspaceId, id: others }, attributes: ['id', 'name'] })).map((p) => [p.id, p.name]));
  return rows.map((r, i) => ({
    id: r.id,
    colleague: { id: others[i], name: names.get(others[i]) ?? 'a former colleague' },
    together: r.score >= 0 && !r.neverTogether,
    status: r.status,
    createdAt: new Date(r.createdAt).toISOString(),
  }));
}

export async function requestPairing(workspaceId: number, personId: number, body: { colleagueId: number; together: boolean; reason: string }): Promise<MyPairingRequest> {
  if (body.colleagueId === personId) throw new HttpError(422, 'unprocessable', 'Choose a colleague other than yourself', [{ path: 'body.colleagueId', message: 'that is you' }]);
  const colleague = await Person.findOne({ where: { workspaceId, id: body.colleagueId, archivedAt: null }, attributes: ['id', 'name'] });
  if (!colleague) throw new HttpError(422, 'unprocessable', 'There is no such colleague in this workspace', [{ path: 'body.colleagueId', message: 'unknown colleague' }]);
  const [a, b] = personId < colleague.id ? [personId, colleague.id] : [colleague.id, personId];
  const existing = await PairingRow.findOne({ where: { workspaceId, personAId: a, personBId: b } });
  if (existing) {
    // Whether a coordinator already recorded something about the two is theirs to share, not ours.
    const mine = existing.requestedByPersonId === personId;
    throw new HttpError(
      409,
      'conflict',
      mine
        ? `You have already asked about working with ${colleague.name}; withdraw that request first to ask again.`
        : `A coordinator already looks after how you and ${colleague.name} are rostered; please talk to them.`,
      [{ path: 'body.colleagueId', message: mine ? 'already requested' : 'already on record' }],
    );
  }
  // Simultaneous requests both pass the check above; the unique index (workspace, a, b) lets one in.
  const row = await PairingRow.create({
    workspaceId,
    personAId: a,
    personBId: b,
    score: body.together ? SUGGESTED_SCORE : -SUGGESTED_SCORE,
    neverTogether: false,
    status: 'requested',
    reason: body.reason,
    requestedByPersonId: personId,
  }).catch((err: unknown) => {
    if (!(err instanceof UniqueConstraintError)) throw err;
    throw new HttpError(409, 'conflict', `You have already asked about working with ${colleague.name}; withdraw that request first to ask again.`, [{ path: 'body.colleagueId', message: 'already requested' }]);
  });
  return { id: row.id, colleague: { id: colleague.id, name: colleague.name }, together: body.together, status: 'requested', createdAt: new Date(row.createdAt).toISOString() };
}

/** Withdraws a request that no coordinator has decided yet. */
export async function withdrawPairingRequest(workspaceId: number, personId: number, id: number): Promise<void> {
  const row = await PairingRow.findOne({ where: { id, workspaceId, requestedByPersonId: personId } });
  if (!row) throw notFound('Pairing request');
  if (row.status !== 'requested') {
    throw new HttpError(409, 'conflict', `A coordinator has already ${row.status} this request; talk to them to change it`, [{ path: 'params.id', message: `already ${row.status}` }]);
  }
  const count = await PairingRow.destroy({ where: { id, workspaceId, requestedByPersonId: personId, status: 'requested' } });
  if (count === 0) throw new HttpError(409, 'conflict', 'A coordinator decided this request a moment ago; reload to see it', [{ path: 'params.id', message: 'decided meanwhile' }]);
}
