import { EventEmitter } from 'node:events';
import type { QueueEvents } from 'bullmq';
import type { Sequelize } from 'sequelize';
import { runEventsOf, runJobId } from './queues';

/** What a stream of one run hears: the solver's progress as the worker reported it, or that the job moved on (re-read the row). */
export type RunSignal = { type: 'progress'; progress: Record<string, unknown> } | { type: 'moved'; state: string };

const MOVES = ['active', 'completed', 'failed', 'removed', 'delayed', 'waiting', 'stalled'] as const;

const hubs = new WeakMap<QueueEvents, EventEmitter>();

/** One dispatcher per QueueEvents, so a thousand open streams cost one Redis listener, not a thousand. */
function dispatcherOf(events: QueueEvents): EventEmitter {
  let hub = hubs.get(events);
  if (hub) return hub;
  const created = new EventEmitter();
  created.setMaxListeners(0);
  events.on('progress', ({ jobId, data }) => {
    if (data && typeof data === 'object') created.emit(jobId, { type: 'progress', progress: data as Record<string, unknown> } satisfies RunSignal);
  });
  for (const state of MOVES) events.on(state as 'active', ({ jobId }: { jobId: string }) => created.emit(jobId, { type: 'moved', state } satisfies RunSignal));
  hubs.set(events, created);
  hub = created;
  return hub;
}

/**
 * Calls `listener` for each BullMQ queue event of one run's job, in every API process (queue
 * events travel through a Redis stream). Resolves to the function that stops listening; rejects
 * when the queue's events cannot be reached within `readyMs` (the caller falls back to reading
 * the row now and then).
 */
export async function watchRun(sequelize: Sequelize, runId: number, listener: (signal: RunSignal) => void, readyMs = 2000): Promise<() => void> {
  let timer: ReturnType<typeof setTimeout> | undefined;
  const events = await Promise.race([
    runEventsOf(sequelize),
    new Promise<never>((_, reject) => (timer = setTimeout(() => reject(new Error('queue events not reachable')), readyMs))),
  ]).finally(() => clearTimeout(timer));
  const hub = dispatcherOf(events);
  const jobId = runJobId(runId);
  hub.on(jobId, listener);
  return () => hub.off(jobId, listener);
}
