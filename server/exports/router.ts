import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { idParams } from '../../shared/api/paging';
import { exportStatus, sendExportFile } from './jobs';

/**
 * Large exports prepared by a worker (server/exports/jobs.ts): the status a 202's Location points
 * at, and the file once it is made. Only people who may ask for the exports (coordinators and
 * admins) read them, and only their own workspace's.
 */
export function exportsRouter() {
  const r = new ApiRoutes('/exports');
  r.get('/:id', COORDINATOR_UP, validate({ params: idParams }), async (req, res) => {
    res.json({ export: await exportStatus(req.auth!.workspaceId, Number(req.params.id)) });
  });
  r.get('/:id/file', COORDINATOR_UP, validate({ params: idParams }), async (req, res) => {
    await sendExportFile(res, req.auth!.workspaceId, Number(req.params.id));
  });
  return r.router;
}
