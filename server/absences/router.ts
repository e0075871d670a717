import type { Request } from 'express';
import type { Env } from '../env';
import type { Mailer } from '../mail/mailer';
import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { HttpError } from '../http/errors';
import { validate } from '../http/validate';
import { idParams } from '../../shared/api/paging';
import { rosterIdParams } from '../../shared/api/rosters';
import {
  absenceCoverBody,
  absenceDecisionBody,
  absenceImportBody,
  absenceSettingsBody,
  absencesListQuery,
  createAbsenceBody,
  updateAbsenceBody,
  type AbsenceDecisionDto,
} from '../../shared/api/absences';
import { enforcePlanLimit, requireRunsAllowed } from '../billing/limits';
import { rosterStatus } from '../rosters/repository';
import { absenceSettings, createAbsence, decideAbsence, deleteAbsence, listAbsences, putAbsenceSettings, updateAbsence } from './repository';
import { absenceConflicts } from './conflicts';
import { importAbsences } from './import';
import { mailDecision } from './notify';
import { startAbsenceCover } from './cover';

const ws = (req: Request) => req.auth!.workspaceId;

/** /api/absences: coordinators enter, edit, approve or decline absences, import them, and see what they take away. */
export function absencesRouter(deps: { env: Env; mailer: Mailer }) {
  const r = new ApiRoutes('/absences');
  r.get('/', COORDINATOR_UP, validate({ query: absencesListQuery }), async (req, res) => {
    res.json({ items: await listAbsences(ws(req), req.query as never) });
  });
  r.post('/', COORDINATOR_UP, validate({ body: createAbsenceBody }), async (req, res) => {
    res.status(201).json(await createAbsence(ws(req), req.body, { userId: req.auth!.userId, status: 'approved' }));
  });
  // Fixed paths before /:id, so "settings" is never read as an id.
  r.get('/settings', COORDINATOR_UP, async (req, res) => {
    res.json(await absenceSettings(ws(req)));
  });
  r.put('/settings', COORDINATOR_UP, validate({ body: absenceSettingsBody }), async (req, res) => {
    res.json(await putAbsenceSettings(ws(req), req.body));
  });
  r.get('/conflicts', COORDINATOR_UP, async (req, res) => {
    res.json({ items: await absenceConflicts(ws(req)) });
  });
  r.post('/import', COORDINATOR_UP, validate({ body: absenceImportBody }), async (req, res) => {
    try {
      res.json(await importAbsences(ws(req), req.body, req.auth!.userId));
    } catch (err) {
      // A refused import still answers with the row-by-row report, so the screen can show every problem.
      const report = (err as { report?: unknown }).report;
      if (!(err instanceof HttpError) || !report) throw err;
      res.status(err.status).json({ error: { code: err.code, message: err.message, fields: err.fields }, report });
    }
  });
  r.patch('/:id', COORDINATOR_UP, validate({ params: idParams, body: updateAbsenceBody }), async (req, res) => {
    res.json(await updateAbsence(ws(req), Number(req.params.id), req.body));
  });
  r.post('/:id/decision', COORDINATOR_UP, validate({ params: idParams, body: absenceDecisionBody }), async (req, res) => {
    const { dto, changed } = await decideAbsence(ws(req), Number(req.params.id), req.body, req.auth!.userId);
    // Deciding the same way twice (a double click) tells the person once.
    const mail = changed ? await mailDecision(ws(req), dto, { mailer: deps.mailer, publicUrl: deps.env.publicUrl }) : { to: null, sent: false };
    res.json({ ...dto, mail } satisfies AbsenceDecisionDto);
  });
  r.delete('/:id', COORDINATOR_UP, validate({ params: idParams }), async (req, res) => {
    await deleteAbsence(ws(req), Number(req.params.id));
    res.status(204).end();
  });
  return r.router;
}

/** A published roster is reopened by a cover run, and a reopened roster counts as one in progress again (as for /reopen). */
const reopening = async (req: Request) => ((await rosterStatus(ws(req), Number(req.params.rosterId))) === 'published' ? 1 : 0);

/** /api/rosters/:rosterId/absence-cover: mounted with the other roster routers. */
export function absenceCoverRouter() {
  const r = new ApiRoutes('/rosters');
  r.post('/:rosterId/absence-cover', COORDINATOR_UP, validate({ params: rosterIdParams, body: absenceCoverBody }), requireRunsAllowed, enforcePlanLimit('activeRosters', reopening), async (req, res) => {
    res.status(202).json(await startAbsenceCover(ws(req), Number(req.params.rosterId), req.body));
  });
  return r.router;
}
