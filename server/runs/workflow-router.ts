import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { manualRunBody, priceConcessionBody, rosterIdParams, runIdParams, seatAlternativesParams } from '../../shared/api/rosters';
import { refuseWhenPublished } from '../rosters/publish';
import { seatAlternatives } from './alternatives';
import { saveManualRun } from './manual';
import { concessionsOf, priceConcession } from './price';
import { findRun } from './run-view';
import { requireRunsAllowed } from '../billing/limits';

const ws = (req: { auth?: { workspaceId: number } }) => req.auth!.workspaceId;

/** Understanding and adjusting a run: concessions and their price, seat alternatives, hand-edited saves. */
export function runWorkflowRouters() {
  const runs = new ApiRoutes('/runs');
  runs.get('/:id/concessions', COORDINATOR_UP, validate({ params: runIdParams }), async (req, res) => {
    const run = await findRun(ws(req), Number(req.params.id));
    res.json({ items: concessionsOf(run.result).map((c, index) => ({ index, ...c })) });
  });
  // Pricing a concession solves the roster again, so it waits like a new run while a payment is overdue.
  runs.post('/:id/concession-price', COORDINATOR_UP, validate({ params: runIdParams, body: priceConcessionBody }), requireRunsAllowed, async (req, res) => {
    res.json(await priceConcession(ws(req), Number(req.params.id), req.body.index, req.body));
  });
  runs.get('/:id/seats/:seatId/alternatives', COORDINATOR_UP, validate({ params: seatAlternativesParams }), async (req, res) => {
    res.json(await seatAlternatives(ws(req), Number(req.params.id), Number(req.params.seatId)));
  });

  const rosters = new ApiRoutes('/rosters');
  rosters.post('/:rosterId/manual-runs', COORDINATOR_UP, validate({ params: rosterIdParams, body: manualRunBody }), refuseWhenPublished, async (req, res) => {
    res.status(201).json(await saveManualRun(ws(req), Number(req.params.rosterId), req.body));
  });
  return [rosters.router, runs.router] as const;
}
