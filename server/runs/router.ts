import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { idParams } from '../../shared/api/paging';
import type { RunRow } from '../rosters/models';
import { cachedRun, FINAL_STATUSES, rememberRun } from './result-cache';
import { runNumber } from './numbering';
import { runEventStream } from './events-stream';
import { cancelRun, findRun, runAssignments } from './repository';

const ws = (req: { auth?: { workspaceId: number } }) => req.auth!.workspaceId;

export const toRunDto = (r: RunRow, number: number) => ({
  id: r.id,
  number,
  rosterId: r.rosterId,
  status: r.status,
  parameters: r.parameters,
  progress: r.progress ?? null,
  score: r.score ?? null,
  bound: r.bound ?? null,
  gap: r.gap ?? null,
  rosterVersion: r.rosterVersion,
  cancelRequested: r.cancelRequested,
  startedAt: r.startedAt ?? null,
  finishedAt: r.finishedAt ?? null,
  timeMs: r.timeMs ?? null,
  error: r.error ?? null,
  createdAt: r.createdAt,
});

/** /api/runs/:id: a run with its roster, its live progress, cancelling it. Starting one is under /rosters (roster-runs-router.ts). */
export function runsRouter() {
  const runs = new ApiRoutes('/runs');
  runs.get('/:id', COORDINATOR_UP, validate({ params: idParams }), async (req, res) => {
    const cached = cachedRun(Number(req.params.id), ws(req));
    if (cached) return void res.type('json').set('ETag', cached.etag).send(cached.json);
    const run = await findRun(ws(req), Number(req.params.id));
    const body = { ...toRunDto(run, await runNumber(run)), result: run.result ?? null, assignments: await runAssignments(run) };
    if (FINAL_STATUSES.has(run.status)) {
      const entry = rememberRun(run.id, run.workspaceId, body);
      return void res.type('json').set('ETag', entry.etag).send(entry.json);
    }
    res.json(body);
  });
  // Live progress for the client (server-sent events); polling GET /api/runs/:id stays the fallback.
  runs.get('/:id/events', COORDINATOR_UP, validate({ params: idParams }), runEventStream(async (r) => toRunDto(r, await runNumber(r))));
  runs.post('/:id/cancel', COORDINATOR_UP, validate({ params: idParams }), async (req, res) => {
    const now = await cancelRun(ws(req), Number(req.params.id));
    res.status(202).json(toRunDto(now, await runNumber(now)));
  });
  return runs.router;
}
