import { parentPort } from 'node:worker_threads';
import { computeSeatAlternatives, type ComputeInput } from './alternatives-compute';

/**
 * Seat alternatives off the server's event loop (server/runs/alternatives-pool.ts starts it):
 * compiling a large roster, building its engine and the dual pass take seconds and hundreds of
 * megabytes, which belong here, not in the process answering requests. Requests are worked one
 * at a time; the compiled models stay cached in this thread between requests.
 */
let queue = Promise.resolve();
parentPort!.on('message', (msg: { id: number; input: ComputeInput }) => {
  queue = queue.then(async () => {
    try {
      parentPort!.postMessage({ id: msg.id, output: await computeSeatAlternatives(msg.input) });
    } catch (err) {
      parentPort!.postMessage({ id: msg.id, error: err instanceof Error ? err.message : String(err) });
    }
  });
});
