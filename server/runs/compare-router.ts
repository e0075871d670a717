import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { rosterIdParams } from '../../shared/api/rosters';
import { compareQuery } from '../../shared/api/compare';
import { requireRoster } from '../rosters/repository';
import { compareRuns } from './compare';

/** GET /api/rosters/:rosterId/compare?a=&b=: two runs of a roster side by side. */
export function compareRouter() {
  const r = new ApiRoutes('/rosters');
  r.get('/:rosterId/compare', COORDINATOR_UP, validate({ params: rosterIdParams, query: compareQuery }), async (req, res) => {
    const rosterId = Number(req.params.rosterId);
    await requireRoster(req.auth!.workspaceId, rosterId);
    const q = req.query as unknown as { a: number; b: number };
    res.json(await compareRuns(req.auth!.workspaceId, rosterId, q.a, q.b));
  });
  return r.router;
}
