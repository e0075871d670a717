import { parentPort, workerData } from 'node:worker_threads';
import { executeRun } from './execute';
import type { Roster } from '../../shared/roster/schema';

/**
 * Runs one solve off the server's event loop. Messages out: progress, then done or failed.
 * Message in: 'cancel', which stops the solver at its next step with the best roster so far.
 */
const controller = new AbortController();
parentPort!.on('message', (msg) => {
  if (msg === 'cancel') controller.abort();
});

const { roster, params } = workerData as { roster: Roster; params: { timeLimitSeconds: number; seed: number } };
executeRun(roster, params, (progress) => parentPort!.postMessage({ type: 'progress', progress }), controller.signal)
  .then((result) => parentPort!.postMessage(result.ok ? { type: 'done', outcome: result.outcome } : { type: 'failed', reasons: result.reasons }))
  .catch((err: unknown) => parentPort!.postMessage({ type: 'error', message: err instanceof Error ? err.message : String(err) }));
