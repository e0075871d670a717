import { Person } from '../db/models';
import { PairingRow } from '../rosters/models';
import { toPairingDto } from '../rosters/repository';
import type { PairingDto, PairingStatus } from '../../shared/api/pairings';

const key = (s: string) => s.toLocaleLowerCase('en');

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
      ...toPairingDto(r as never),
      personAName: names.get(r.personAId) ?? '?',
      personBName: names.get(r.personBId) ?? '?',
      requestedByName: r.requestedByPersonId ? (names.get(r.requestedByPersonId) ?? null) : null,
      updatedAt: new Date(r.updatedAt).toISOString(),
    }))
    .filter((p) => !q || key(p.personAName).includes(q) || key(p.personBName).includes(q))
    .sort((a, b) => a.personAName.localeCompare(b.personAName) || a.personBName.localeCompare(b.personBName));
}
