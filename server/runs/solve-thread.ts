import { parentPort, workerData } from 'node:worker_threads';
import { computeMarginals } from '../../solver/inference/marginals';
import { executeRun } from './execute';
import { summariseContest } from './seat-contention';
import type { Roster, RosterAssignment } from '../../shared/roster/schema';
import type { DualStart } from '../../solver/roster/lagrangian';

/**
 * Runs one solve off the server's event loop. Messages out: progress, then done or failed; after
 * done, when asked for (`marginalsMs`), a 'contest' message with the run's sum-product marginals
 * (server/runs/seat-contention.ts). The run worker waits a bounded time for it and then ends the thread,
 * so a model too large for one sum-product pass simply has none.
 * Message in: 'cancel', which stops the solver at its next step with the best roster so far.
 */
const controller = new AbortController();
parentPort!.on('message', (msg) => {
  if (msg === 'cancel') controller.abort();
});

const { roster, params, start, dualStart } = workerData as { roster: Roster; params: { timeLimitSeconds: number; seed: number; marginalsMs?: number }; start?: RosterAssignment; dualStart?: DualStart };
executeRun(roster, params, (progress) => parentPort!.postMessage({ type: 'progress', progress }), controller.signal, start, dualStart)
  .then((result) => {
    parentPort!.postMessage(result.ok ? { type: 'done', outcome: result.outcome } : { type: 'failed', reasons: result.reasons });
    if (result.ok && params.marginalsMs) {
      const started = Date.now();
      const m = computeMarginals(result.compiled.model, { timeLimitMs: params.marginalsMs });
      parentPort!.postMessage({ type: 'contest', contest: summariseContest(result.compiled, m, result.outcome.assignment, Date.now() - started) });
    }
  })
  .catch((err: unknown) => parentPort!.postMessage({ type: 'error', message: err instanceof Error ? err.message : String(err) }));
