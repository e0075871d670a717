import type { Env } from '../env';
import type { Mailer } from '../mail/mailer';
import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { publishBody, reopenBody, rosterExportQuery, rosterIdParams } from '../../shared/api/rosters';
import { exportCsv, exportIcs, publishRoster, reopenRoster } from './publish';
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
  r.get('/:rosterId/roster.csv', COORDINATOR_UP, validate({ params: rosterIdParams, query: rosterExportQuery }), async (req, res) => {
    const file = await exportCsv(ws(req), rid(req), req.query as { runId?: number; personId?: number });
    res.setHeader('Content-Type', 'text/csv; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename="${file.filename}"`);
    res.send(file.body);
  });
  r.get('/:rosterId/roster.ics', COORDINATOR_UP, validate({ params: rosterIdParams, query: rosterExportQuery }), async (req, res) => {
    const file = await exportIcs(ws(req), rid(req), req.query as { runId?: number; personId?: number });
    res.setHeader('Content-Type', 'text/calendar; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename="${file.filename}"`);
    res.send(file.body);
  });
  return r.router;
}
