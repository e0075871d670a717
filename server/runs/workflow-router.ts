import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { priceConcessionBody, runIdParams, seatAlternativesParams } from '../../shared/api/rosters';
import { refuseUnfinished } from './alternatives';
import { concessionsOf } from './concession-price';
import { computeForRun, findRun, findRunStatus } from './repository';
import { requireRunsAllowed } from '../billing/limits';

const ws = (req: { auth?: { workspaceId: number } }) => req.auth!.workspaceId;

/** Understanding a run: concessions and their price, seat alternatives. Hand-edited saves are under /rosters (roster-runs-router.ts). */
export function runWorkflowRouter() {
  const runs = new ApiRoutes('/runs');
  runs.get('/:id/concessions', COORDINATOR_UP, validate({ params: runIdParams }), async (req, res) => {
    const run = await findRun(ws(req), Number(req.params.id));
    res.json({ items: concessionsOf(run.result).map((c, index) => ({ index, ...c })) });
  });
  // Pricing a concession solves the roster again, so it waits like a new run while a payment is overdue.
  runs.post('/:id/concession-price', COORDINATOR_UP, validate({ params: runIdParams, body: priceConcessionBody }), requireRunsAllowed, async (req, res) => {
    // The run is looked up here (a cheap read) so another workspace's id is a 404 without a worker; the re-solve is a job.
    const run = await findRun(ws(req), Number(req.params.id));
    const params = { timeLimitSeconds: req.body.timeLimitSeconds, seed: req.body.seed };
    res.json(await computeForRun({ kind: 'price', workspaceId: ws(req), runId: run.id, index: req.body.index, params }, params.timeLimitSeconds * 1000 + 120_000, 'the price of this concession'));
  });
  runs.get('/:id/seats/:seatId/alternatives', COORDINATOR_UP, validate({ params: seatAlternativesParams }), async (req, res) => {
    const run = await findRunStatus(ws(req), Number(req.params.id));
    refuseUnfinished(run);
    res.json(await computeForRun({ kind: 'alternatives', workspaceId: ws(req), runId: run.id, seatId: Number(req.params.seatId) }, 150_000, 'the alternatives for this seat'));
  });
  return runs.router;
}
