import { Person, Workspace } from '../db/models';
import { runShifts, type PublishedSnapshot } from '../rosters/publish';
import type { Roster } from '../rosters/models';

/**
 * The published snapshot after an approved change: the kept snapshot with only the changed
 * seats' people replaced, so names and times published earlier stay as they were published
 * (docs/security.md, "Nothing lost"). A roster published before snapshots existed gets one
 * taken from the run that was published. `moves` holds database ids: shift id, the person leaving, the one coming.
 */
export async function snapshotAfterChange(
  workspaceId: number,
  roster: Roster,
  newRunId: number,
  changedAt: Date,
  moves: Array<{ shiftId: number; from: number | null; to: number | null }>,
): Promise<PublishedSnapshot> {
  const kept = await currentSnapshot(workspaceId, roster);
  const published = new Map<number, string>();
  for (const s of kept.shifts) for (const p of s.people) published.set(p.personId, p.name);
  const newcomers = moves.map((m) => m.to).filter((id): id is number => id !== null && !published.has(id));
  for (const p of newcomers.length ? await Person.findAll({ where: { workspaceId, id: newcomers }, attributes: ['id', 'name'] }) : []) published.set(p.id, p.name);
  const shifts = kept.shifts.map((s) => ({ ...s, people: s.people.slice() }));
  for (const m of moves) {
    const shift = shifts.find((s) => s.id === m.shiftId);
    if (!shift) continue;
    const at = m.from === null ? -1 : shift.people.findIndex((p) => p.personId === m.from);
    const incoming = m.to === null ? null : { personId: m.to, name: published.get(m.to) ?? `person ${m.to}` };
    if (at >= 0) {
      if (incoming) shift.people[at] = incoming;
      else shift.people.splice(at, 1);
    } else if (incoming) shift.people.push(incoming);
  }
  // The stamp is the change's time: an exported event's DTSTAMP moves on when the roster did.
  return { ...kept, runId: newRunId, publishedAt: changedAt.toISOString(), shifts };
}

/** The kept snapshot, or (for a roster published before snapshots existed) one read from its published run. */
async function currentSnapshot(workspaceId: number, roster: Roster): Promise<PublishedSnapshot> {
  const kept = roster.publishedSnapshot as PublishedSnapshot | null;
  if (kept && kept.runId === roster.publishedRunId) return kept;
  const { shifts } = await runShifts(workspaceId, roster.id, roster.publishedRunId!);
  const workspace = await Workspace.findByPk(workspaceId);
  const publishedAt = new Date(roster.publishedAt ?? Date.now()).toISOString();
  return { format: 1, runId: roster.publishedRunId!, rosterName: roster.name, timeZone: roster.timeZone, workspaceName: workspace?.name ?? null, publishedAt, shifts };
}
