import type { Env } from '../env';
import type { Mailer } from '../mail/mailer';
import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { publishBody, reopenBody, rosterExportQuery, rosterIdParams } from '../../shared/api/rosters';
import { publishRoster, reopenRoster } from './publish';
import { answerExport } from '../exports/jobs';
import { enforcePlanLimit } from '../billing/limits';

const ws = (req: { auth?: { workspaceId: number } }) => req.auth!.workspaceId;
const rid = (req: { params: Record<string, unknown> }) => Number(req.params.rosterId);

/** Publish (freeze + e-mail everyone their shifts), reopen, and the CSV and iCalendar files. */
export function publishRouter(deps: { env: Env; mailer: Mailer }) {
  const r = new ApiRoutes('/rosters');
  r.post('/:rosterId/publish', COORDINATOR_UP, validate({ params: rosterIdParams, body: publishBody }), async (req, res) => {
    res.json(await publishRoster(ws(req), rid(req), req.body, { mailer: deps.mailer, publicUrl: deps.env.publicUrl }));
  });
  // A reopened roster is in progress again, so it counts against the plan's limit like a new one.
  r.post('/:rosterId/reopen', COORDINATOR_UP, validate({ params: rosterIdParams, body: reopenBody }), enforcePlanLimit('activeRosters'), async (req, res) => {
    res.json(await reopenRoster(ws(req), rid(req), req.body.version));
  });
  // Small files are sent at once; large ones are made by a worker (202, server/exports/jobs.ts).
  r.get('/:rosterId/roster.csv', COORDINATOR_UP, validate({ params: rosterIdParams, query: rosterExportQuery }), async (req, res) => {
    const q = req.query as { runId?: number; personId?: number };
    await answerExport(req, res, { kind: 'roster-csv', rosterId: rid(req), ...(q.runId ? { runId: q.runId } : {}), ...(q.personId ? { personId: q.personId } : {}) });
  });
  r.get('/:rosterId/roster.ics', COORDINATOR_UP, validate({ params: rosterIdParams, query: rosterExportQuery }), async (req, res) => {
    const q = req.query as { runId?: number; personId?: number };
    await answerExport(req, res, { kind: 'roster-ics', rosterId: rid(req), ...(q.runId ? { runId: q.runId } : {}), ...(q.personId ? { personId: q.personId } : {}) });
  });
  return r.router;
}
