import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { HttpError } from '../http/errors';
import { rosterIdParams } from '../../shared/api/rosters';
import { compareQuery } from '../../shared/api/compare';
import { Roster } from '../rosters/models';
import { compareRuns } from './compare';

/** GET /api/rosters/:rosterId/compare?a=&b=: two runs of a roster side by side. */
export function compareRouter() {
  const r = new ApiRoutes('/rosters');
  r.get('/:rosterId/compare', COORDINATOR_UP, validate({ params: rosterIdParams, query: compareQuery }), async (req, res) => {
    const rosterId = Number(req.params.rosterId);
    if (!(await Roster.count({ where: { id: rosterId, workspaceId: req.auth!.workspaceId } }))) throw new HttpError(404, 'not_found', 'Roster not found', [{ path: 'params.rosterId', message: 'no such roster in this workspace' }]);
    const q = req.query as unknown as { a: number; b: number };
    res.json(await compareRuns(req.auth!.workspaceId, rosterId, q.a, q.b));
  });
  return r.router;
}
