import { UniqueConstraintError } from 'sequelize';
import { Person } from '../db/models';
import { HttpError, notFound } from '../http/errors';
import { updateVersioned } from '../http/versioned';
import { PairingRow } from '../rosters/models';
import type { PairingDto, PairingStatus } from '../../shared/api/pairings';

const key = (s: string) => s.toLocaleLowerCase('en');

export const toPairingDto = (p: PairingRow) => ({
  id: p.id,
  personAId: p.personAId,
  personBId: p.personBId,
  score: p.score,
  neverTogether: p.neverTogether,
  status: p.status,
  reason: p.reason ?? null,
  version: p.version,
});

export async function createPairing(workspaceId: number, body: { personAId: number; personBId: number; score: number; neverTogether: boolean; reason?: string | null }) {
  const [a, b] = body.personAId < body.personBId ? [body.personAId, body.personBId] : [body.personBId, body.personAId];
  const found = await Person.findAll({ where: { workspaceId, id: [a, b], archivedAt: null }, attributes: ['id'] });
  for (const [field, id] of [['personAId', body.personAId], ['personBId', body.personBId]] as const) {
    if (!found.some((p) => p.id === id)) throw new HttpError(422, 'unprocessable', 'Unknown person', [{ path: `body.${field}`, message: 'unknown person' }]);
  }
  const exists = () => new HttpError(409, 'conflict', 'These two people already have a pairing; edit it instead', [{ path: 'body.personBId', message: 'pairing exists' }]);
  if (await PairingRow.findOne({ where: { workspaceId, personAId: a, personBId: b } })) throw exists();
  // Two creates at once both pass the check; the unique index (workspace, a, b) decides, and the loser hears 409.
  const row = await PairingRow.create({ workspaceId, personAId: a, personBId: b, score: body.score, neverTogether: body.neverTogether, reason: body.reason ?? null }).catch((err: unknown) => {
    throw err instanceof UniqueConstraintError ? exists() : err;
  });
  return toPairingDto(row);
}

export async function updatePairing(workspaceId: number, id: number, body: { version: number; score?: number; neverTogether?: boolean; status?: 'approved' | 'requested' | 'declined' }) {
  const { version, ...changes } = body;
  await updateVersioned(PairingRow, { id, workspaceId }, version, changes, 'Pairing');
  return toPairingDto((await PairingRow.findOne({ where: { id, workspaceId } }))!);
}

export async function deletePairing(workspaceId: number, id: number): Promise<void> {
  const count = await PairingRow.destroy({ where: { id, workspaceId } });
  if (count === 0) throw notFound('Pairing');
}

/**
 * The workspace's pairings with both people's names (and who asked, for staff requests), optionally
 * only one status and only pairs where either name contains `q`. Pairings are few per workspace, so the names are joined here.
 */
export async function listPairings(workspaceId: number, filter: { status?: PairingStatus; q?: string } = {}): Promise<PairingDto[]> {
  const [rows, people] = await Promise.all([
    PairingRow.findAll({ where: { workspaceId, ...(filter.status ? { status: filter.status } : {}) }, order: [['id', 'ASC']] }),
    Person.findAll({ where: { workspaceId }, attributes: ['id', 'name'] }),
  ]);
  const names = new Map(people.map((p) => [p.id, p.name]));
  const q = filter.q?.trim() ? key(filter.q.trim()) : null;
  return rows
    .map((r) => ({
      ...toPairingDto(r),
      personAName: names.get(r.personAId) ?? '?',
      personBName: names.get(r.personBId) ?? '?',
      requestedByName: r.requestedByPersonId ? (names.get(r.requestedByPersonId) ?? null) : null,
      updatedAt: new Date(r.updatedAt).toISOString(),
    }))
    .filter((p) => !q || key(p.personAName).includes(q) || key(p.personBName).includes(q))
    .sort((a, b) => a.personAName.localeCompare(b.personAName) || a.personBName.localeCompare(b.personBName));
}
