import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { HttpError } from '../http/errors';
import { manualRunBody, priceConcessionBody, rosterIdParams, runIdParams, seatAlternativesParams } from '../../shared/api/rosters';
import { refuseWhenPublished } from '../rosters/publish';
import { saveManualRun } from './manual';
import { refuseUnfinished } from './alternatives';
import { concessionsOf } from './concession-price';
import { RunRow } from '../rosters/models';
import { computeOnWorker } from '../queue/queues';
import { findRun } from './run-view';
import { requireRunsAllowed } from '../billing/limits';
import { recordManualPreferenceQuietly } from '../learning/service';

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
    // The run is looked up here (a cheap read) so another workspace's id is a 404 without a worker; the re-solve is a job.
    const run = await findRun(ws(req), Number(req.params.id));
    const params = { timeLimitSeconds: req.body.timeLimitSeconds, seed: req.body.seed };
    res.json(await computeOnWorker(RunRow.sequelize!, { kind: 'price', workspaceId: ws(req), runId: run.id, index: req.body.index, params }, params.timeLimitSeconds * 1000 + 120_000, 'the price of this concession'));
  });
  runs.get('/:id/seats/:seatId/alternatives', COORDINATOR_UP, validate({ params: seatAlternativesParams }), async (req, res) => {
    const run = await RunRow.findOne({ where: { id: Number(req.params.id), workspaceId: ws(req) }, attributes: ['id', 'status'] });
    if (!run) throw new HttpError(404, 'not_found', 'Run not found', [{ path: 'params.id', message: 'no such run in this workspace' }]);
    refuseUnfinished(run);
    res.json(await computeOnWorker(RunRow.sequelize!, { kind: 'alternatives', workspaceId: ws(req), runId: run.id, seatId: Number(req.params.seatId) }, 150_000, 'the alternatives for this seat'));
  });

  const rosters = new ApiRoutes('/rosters');
  rosters.post('/:rosterId/manual-runs', COORDINATOR_UP, validate({ params: rosterIdParams, body: manualRunBody }), refuseWhenPublished, async (req, res) => {
    const saved = await saveManualRun(ws(req), Number(req.params.rosterId), req.body);
    await recordManualPreferenceQuietly(ws(req), Number(req.params.rosterId), req.auth!.userId, saved.runId, req.body.basedOnRunId); // the edit as a preference (server/learning)
    res.status(201).json(saved);
  });
  return [rosters.router, runs.router] as const;
}
