/**
 * Who a publication will e-mail, before it is sent: the publish button asks for confirmation
 * with this list. It follows publishRoster (server/rosters/publish.ts): a first publication mails
 * everyone with a shift; a re-publication after a reopen mails only the people whose shifts
 * changed against the run published before (added or removed shifts).
 */
import { Person, User } from '../db/models';
import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { HttpError } from '../http/errors';
import { rosterIdParams } from '../../shared/api/rosters';
import { publishPreviewQuery, type PublishPreview } from '../../shared/api/publish-preview';
import { runShifts } from './publish';
import { findRoster } from './repository';

export async function publishPreview(workspaceId: number, rosterId: number, runId: number): Promise<PublishPreview> {
  const roster = await findRoster(workspaceId, rosterId);
  if (roster.status === 'published') throw new HttpError(409, 'conflict', 'This roster is already published. Reopen it first to publish another version.', [{ path: 'params.rosterId', message: 'already published' }]);
  const now = await runShifts(workspaceId, rosterId, runId);
  const before = roster.publishedRunId ? await runShifts(workspaceId, rosterId, roster.publishedRunId).catch(() => null) : null;
  const shiftsOf = (shifts: typeof now.shifts) => {
    const m = new Map<number, Set<number>>();
    for (const s of shifts) for (const p of s.people) m.set(p.personId, (m.get(p.personId) ?? new Set()).add(s.id));
    return m;
  };
  const mine = shiftsOf(now.shifts);
  const old = before ? shiftsOf(before.shifts) : new Map<number, Set<number>>();
  const ids = [...new Set([...mine.keys(), ...old.keys()])];
  const people = await Person.findAll({ where: { workspaceId, id: ids } });
  const users = await User.findAll({ where: { id: people.map((p) => p.userId).filter((id): id is number => typeof id === 'number') } });
  const userEmail = new Map(users.map((u) => [u.id, u.email]));
  const out: PublishPreview = { runId, firstPublication: !before, willMail: [], noAddress: [], changed: [], unchanged: 0 };
  for (const person of [...people].sort((a, b) => a.name.localeCompare(b.name))) {
    const a = mine.get(person.id) ?? new Set<number>();
    const b = old.get(person.id) ?? new Set<number>();
    const added = [...a].filter((x) => !b.has(x)).length;
    const removed = [...b].filter((x) => !a.has(x)).length;
    if (added + removed === 0) {
      out.unchanged += 1;
      continue;
    }
    // A first publication mails only people with shifts; a re-publication also those whose shifts were all taken away.
    if (!before && a.size === 0) continue;
    out.changed.push({ personId: person.id, name: person.name, added, removed });
    const to = person.email ?? (person.userId ? userEmail.get(person.userId) : undefined);
    if (to) out.willMail.push({ personId: person.id, name: person.name, to, changed: added + removed });
    else out.noAddress.push({ personId: person.id, name: person.name });
  }
  return out;
}

/** GET /api/rosters/:rosterId/publish-preview?runId= */
export function publishPreviewRouter() {
  const r = new ApiRoutes('/rosters');
  r.get('/:rosterId/publish-preview', COORDINATOR_UP, validate({ params: rosterIdParams, query: publishPreviewQuery }), async (req, res) => {
    res.json(await publishPreview(req.auth!.workspaceId, Number(req.params.rosterId), Number((req.query as unknown as { runId: number }).runId)));
  });
  return r.router;
}
