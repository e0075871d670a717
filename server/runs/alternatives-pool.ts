import { Worker } from 'node:worker_threads';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { HttpError } from '../http/errors';
import type { ComputeInput, ComputeOutput } from './alternatives-compute';

/** One thread for seat alternatives, started on first use and ended after a quiet spell (it frees the models' memory). */
const IDLE_MS = 5 * 60_000;
/** A request the thread has not answered by then ends the thread (and every request waiting on it). */
const REQUEST_MS = 120_000;

let thread: Worker | null = null;
let nextId = 1;
let idleTimer: ReturnType<typeof setTimeout> | undefined;
const waiting = new Map<number, { resolve: (o: ComputeOutput) => void; reject: (e: Error) => void; timer: ReturnType<typeof setTimeout> }>();

function stopThread(reason: string): void {
  const t = thread;
  thread = null;
  clearTimeout(idleTimer);
  for (const [id, w] of waiting) {
    clearTimeout(w.timer);
    w.reject(new HttpError(503, 'internal', `Working out the alternatives stopped: ${reason}. Try again.`));
    waiting.delete(id);
  }
  if (t) void t.terminate();
}

function start(): Worker {
  const t = new Worker(path.join(path.dirname(fileURLToPath(import.meta.url)), 'alternatives-thread-entry.mjs'));
  t.unref(); // never keeps the server (or a test run) alive on its own
  t.on('message', (msg: { id: number; output?: ComputeOutput; error?: string }) => {
    const w = waiting.get(msg.id);
    if (!w) return;
    waiting.delete(msg.id);
    clearTimeout(w.timer);
    if (msg.error !== undefined) w.reject(new HttpError(500, 'internal', `Working out the alternatives failed: ${msg.error}`));
    else w.resolve(msg.output!);
    if (waiting.size === 0) idleTimer = setTimeout(() => stopThread('idle'), IDLE_MS);
  });
  t.on('error', (err) => {
    if (thread === t) stopThread(err.message);
  });
  t.on('exit', (code) => {
    if (thread === t) stopThread(`the thread exited (${code})`);
  });
  return t;
}

export function computeInThread(input: ComputeInput): Promise<ComputeOutput> {
  thread ??= start();
  clearTimeout(idleTimer);
  const id = nextId++;
  const t = thread;
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => {
      if (thread === t) stopThread('it took longer than two minutes');
    }, REQUEST_MS);
    waiting.set(id, { resolve, reject, timer });
    t.postMessage({ id, input });
  });
}

/** Ends the thread now (tests, shutdown). */
export function stopAlternativesThread(): void {
  stopThread('stopped');
}
