import { Queue, QueueEvents, type Job } from 'bullmq';
import { Op, type Sequelize } from 'sequelize';
import { readEnv } from '../env';
import { HttpError } from '../http/errors';
import { RunRow } from '../rosters/models';
import { ExportFile } from '../exports/models';
import { producerOptions, queuePrefix, workerOptions } from './connection';

/** Solve runs: one job per run row, id `run-<row id>` (BullMQ refuses custom ids that are plain integers). */
export const RUNS_QUEUE = 'runs';
/** Request-and-answer computations an API request waits for: a concession's price, seat alternatives. */
export const COMPUTE_QUEUE = 'compute';
/** Large exports (grid PDF, CSV, iCalendar): one job per exports row, id `export-<row id>`; the file goes to the row. */
export const EXPORTS_QUEUE = 'exports';

export const runJobId = (runId: number) => `run-${runId}`;
export const runIdOfJob = (jobId: string | undefined) => Number(String(jobId ?? '').replace(/^run-/, ''));

export const exportJobId = (exportId: number) => `export-${exportId}`;

export interface ExportJobData {
  exportId: number;
  workspaceId: number;
}

export interface RunJobData {
  runId: number;
  workspaceId: number;
}

export type ComputeJobData =
  | { kind: 'price'; workspaceId: number; runId: number; index: number; params: { timeLimitSeconds: number; seed: number } }
  | { kind: 'alternatives'; workspaceId: number; runId: number; seatId: number };

/** What a compute job hands back: the answer, or the HttpError the API should send, as data (it crosses Redis). */
export type ComputeJobResult = { ok: true; value: unknown } | { ok: false; status: number; code: string; message: string; fields?: Array<{ path: string; message: string }> };

/** Attempts per run: a second try after a crash or a killed worker, then the run is marked failed in words. */
export const RUN_ATTEMPTS = 2;
/** BullMQ priorities run from 1 (first) to 2^21 − 1. */
const MAX_PRIORITY = 2 ** 21 - 1;

interface Hub {
  url: string;
  prefix: string;
  runs: Queue<RunJobData>;
  compute: Queue<ComputeJobData, ComputeJobResult>;
  exports: Queue<ExportJobData>;
  events: Promise<QueueEvents> | null;
  runEvents: Promise<QueueEvents> | null;
}

const urls = new WeakMap<Sequelize, string>();
const hubs = new WeakMap<Sequelize, Hub>();

/**
 * Which Redis the queues of this database live on. The app and the worker say so from their
 * environment; without it the process environment decides (tests that build an app per file).
 */
export function useRedis(sequelize: Sequelize, url: string): void {
  const hub = hubs.get(sequelize);
  if (hub && hub.url !== url) void closeQueues(sequelize);
  urls.set(sequelize, url);
}

export function queueSettings(sequelize: Sequelize): { url: string; prefix: string } {
  const url = urls.get(sequelize) ?? readEnv(process.env).redis.url;
  return { url, prefix: queuePrefix(sequelize.getDatabaseName()) };
}

let lastLogged = 0;
/** Redis errors arrive as 'error' events; without a listener they would end the process. Logged at most every 30 s. */
export function quietErrors(where: string) {
  return (err: Error) => {
    if (process.env.NODE_ENV === 'test' || Date.now() - lastLogged < 30_000) return;
    lastLogged = Date.now();
    console.error(`[queue] ${where}: ${err.message}`);
  };
}

export function queues(sequelize: Sequelize): Hub {
  let hub = hubs.get(sequelize);
  if (hub) return hub;
  const { url, prefix } = queueSettings(sequelize);
  const runs = new Queue<RunJobData>(RUNS_QUEUE, { connection: producerOptions(url), prefix });
  const compute = new Queue<ComputeJobData, ComputeJobResult>(COMPUTE_QUEUE, { connection: producerOptions(url), prefix });
  const exports = new Queue<ExportJobData>(EXPORTS_QUEUE, { connection: producerOptions(url), prefix });
  runs.on('error', quietErrors('runs queue'));
  compute.on('error', quietErrors('compute queue'));
  exports.on('error', quietErrors('exports queue'));
  hub = { url, prefix, runs, compute, exports, events: null, runEvents: null };
  hubs.set(sequelize, hub);
  return hub;
}

export async function closeQueues(sequelize: Sequelize): Promise<void> {
  const hub = hubs.get(sequelize);
  if (!hub) return;
  hubs.delete(sequelize);
  const [events, runEvents] = await Promise.all([hub.events?.catch(() => null), hub.runEvents?.catch(() => null)]);
  await Promise.allSettled([hub.runs.close(), hub.compute.close(), hub.exports.close(), events?.close(), runEvents?.close()]);
}

export class QueueUnavailableError extends HttpError {
  constructor(message = 'The solve queue cannot be reached just now, so nothing was started. Try again in a few seconds.', retryAfterSeconds = 5) {
    super(503, 'unavailable', message, undefined, { 'Retry-After': String(retryAfterSeconds) });
  }
}

/** Seconds a client is told to wait when no worker serves the compute queue: starting a worker process takes a while. */
export const NO_WORKER_RETRY_AFTER_S = 30;

const noWorker = (what: string) =>
  new QueueUnavailableError(`No solve worker is running just now, so ${what} cannot be worked out. Nothing was started; try again in a minute (a worker is started with npm run worker).`, NO_WORKER_RETRY_AFTER_S);

/**
 * How many worker processes serve the compute queue (BullMQ counts the Redis connections its
 * workers name themselves on). A Redis that cannot list its clients (some hosted ones) answers
 * with a placeholder entry, so this never reports 0 there.
 */
async function computeWorkers(hub: Hub): Promise<number> {
  try {
    return await hub.compute.getWorkersCount();
  } catch {
    throw new QueueUnavailableError();
  }
}

/** How often a waiting request checks that some worker is still there to take its job. */
const WORKER_CHECK_MS = 3000;

/** Resolves when the queue's Redis connection is up; a Redis that is down answers within about two seconds. */
async function ready(queue: Queue<never, never> | Queue<RunJobData> | Queue<ComputeJobData, ComputeJobResult> | Queue<ExportJobData>): Promise<void> {
  let timer: ReturnType<typeof setTimeout> | undefined;
  const client = await Promise.race([queue.client.catch(() => null), new Promise<null>((r) => (timer = setTimeout(() => r(null), 2000)))]);
  clearTimeout(timer);
  if (!client || client.status !== 'ready') throw new QueueUnavailableError();
}

/** Throws QueueUnavailableError (503 with Retry-After) when Redis cannot take a job now. Called before a run row is written. */
export async function requireQueue(sequelize: Sequelize): Promise<void> {
  await ready(queues(sequelize).runs);
}

/**
 * The queue position of a workspace's run: 1 + how many of its runs are already waiting or
 * running. A workspace's first run goes ahead of every other workspace's second, so a flood from
 * one workspace interleaves with the others instead of holding them back (BullMQ takes the lowest
 * number first, oldest first among equals).
 */
export async function runPriority(workspaceId: number, runId: number): Promise<number> {
  const ahead = await RunRow.count({ where: { workspaceId, status: { [Op.in]: ['queued', 'running'] }, id: { [Op.lt]: runId } } });
  return Math.min(MAX_PRIORITY, 1 + ahead);
}

/**
 * Adds the job of a run whose row is committed. The job id is the run's, so adding it twice
 * (the API and the reconciler, or two reconcilers) keeps one job: BullMQ ignores an add whose id
 * exists, and a job for a run that has already finished ends at once in the worker.
 */
export async function enqueueRun(sequelize: Sequelize, run: { id: number; workspaceId: number }): Promise<Job<RunJobData>> {
  const priority = await runPriority(run.workspaceId, run.id);
  return queues(sequelize).runs.add(
    'solve',
    { runId: run.id, workspaceId: run.workspaceId },
    {
      jobId: runJobId(run.id),
      priority,
      attempts: RUN_ATTEMPTS,
      backoff: { type: 'fixed', delay: 1000 },
      // Kept a while so a duplicate add within that time finds the job; the row keeps the result for good.
      removeOnComplete: { age: 3600, count: 5000 },
      removeOnFail: { age: 7 * 86_400 },
    },
  );
}

async function listen(hub: Hub, queue: string): Promise<QueueEvents> {
  const events = new QueueEvents(queue, { connection: workerOptions(hub.url), prefix: hub.prefix });
  events.on('error', quietErrors(`${queue} events`));
  await events.waitUntilReady();
  return events;
}

function eventsOf(hub: Hub): Promise<QueueEvents> {
  hub.events ??= listen(hub, COMPUTE_QUEUE);
  return hub.events;
}

/**
 * The runs queue's events (BullMQ QueueEvents: progress, active, completed, failed, …), one
 * listener per process whatever the number of open streams (server/queue/run-events.ts).
 * A listener that could not start is dropped, so the next call tries again.
 */
export function runEventsOf(sequelize: Sequelize): Promise<QueueEvents> {
  const hub = queues(sequelize);
  hub.runEvents ??= listen(hub, RUNS_QUEUE).catch((err: unknown) => {
    hub.runEvents = null;
    throw err;
  });
  return hub.runEvents;
}

/**
 * Hands a heavy computation to a worker process and waits for its answer, so the API process
 * never runs the solver. `what` names it in the words of an error. With no worker serving the
 * queue the answer is a 503 at once (nobody would take the job); a job still waiting when the last
 * worker goes away is taken back and answered the same way, instead of waiting out the timeout.
 */
export async function computeOnWorker(sequelize: Sequelize, data: ComputeJobData, timeoutMs: number, what: string): Promise<unknown> {
  const hub = queues(sequelize);
  await ready(hub.compute);
  if ((await computeWorkers(hub)) === 0) throw noWorker(what);
  const events = await eventsOf(hub);
  const job = await hub.compute.add(data.kind, data, { attempts: 1, removeOnComplete: { age: 600 }, removeOnFail: { age: 3600 } });
  let watch: ReturnType<typeof setInterval> | undefined;
  const orphaned = new Promise<never>((_, reject) => {
    watch = setInterval(() => {
      void (async () => {
        if ((await computeWorkers(hub).catch(() => 1)) > 0) return;
        if ((await job.getState().catch(() => 'unknown')) !== 'waiting') return;
        await job.remove().catch(() => {});
        reject(noWorker(what));
      })();
    }, WORKER_CHECK_MS);
  });
  orphaned.catch(() => {}); // settled by the race below; this only keeps a late rejection from counting as unhandled
  let result: ComputeJobResult;
  try {
    result = await Promise.race([job.waitUntilFinished(events, timeoutMs), orphaned]);
  } catch (err) {
    if (err instanceof HttpError) throw err;
    const message = err instanceof Error ? err.message : String(err);
    if (/timed out/i.test(message)) {
      // Workers are there but all busy for that long: take the job back so it is not worked for nobody.
      await job.remove().catch(() => {});
      throw new QueueUnavailableError(`The solve workers are all busy: nobody answered ${what} within ${Math.round(timeoutMs / 1000)} s. Try again in a moment.`, NO_WORKER_RETRY_AFTER_S);
    }
    throw new HttpError(500, 'internal', `Working out ${what} failed: ${message}`);
  } finally {
    clearInterval(watch);
  }
  if (!result.ok) throw new HttpError(result.status, result.code as never, result.message, result.fields);
  return result.value;
}

/** Attempts per export: a second try after a crash or a killed worker, then the row says it failed, in words. */
export const EXPORT_ATTEMPTS = 2;

/**
 * Throws a 503 with Retry-After (in words) when no export job could be worked now: Redis away, or
 * no worker process serving the exports queue. Called before an export row is written, so a
 * refused request leaves nothing behind.
 */
export async function requireExportWorker(sequelize: Sequelize): Promise<void> {
  const hub = queues(sequelize);
  await ready(hub.exports);
  let workers: number;
  try {
    workers = await hub.exports.getWorkersCount();
  } catch {
    throw new QueueUnavailableError('The file queue cannot be reached just now, so nothing was started. Try again in a few seconds.');
  }
  if (workers === 0) {
    throw new QueueUnavailableError(
      'No worker is running just now to prepare a file this large, so nothing was started. Try again in a minute (a worker is started with npm run worker); smaller files are answered at once.',
      NO_WORKER_RETRY_AFTER_S,
    );
  }
}

/** How many worker processes serve the exports queue now; null when Redis cannot say. */
export async function exportWorkers(sequelize: Sequelize): Promise<number | null> {
  return queues(sequelize)
    .exports.getWorkersCount()
    .catch(() => null);
}

/** As runPriority: 1 + the workspace's exports already waiting or being made, so one workspace's many files interleave with the others'. */
export async function exportPriority(workspaceId: number, exportId: number): Promise<number> {
  const ahead = await ExportFile.count({ where: { workspaceId, status: { [Op.in]: ['queued', 'running'] }, id: { [Op.lt]: exportId } } });
  return Math.min(MAX_PRIORITY, 1 + ahead);
}

/** Adds the job of an export whose row is committed; the job id is the row's, so a second add (the reconciler) keeps one job. */
export async function enqueueExport(sequelize: Sequelize, row: { id: number; workspaceId: number }): Promise<Job<ExportJobData>> {
  const priority = await exportPriority(row.workspaceId, row.id);
  return queues(sequelize).exports.add(
    'export',
    { exportId: row.id, workspaceId: row.workspaceId },
    { jobId: exportJobId(row.id), priority, attempts: EXPORT_ATTEMPTS, backoff: { type: 'fixed', delay: 500 }, removeOnComplete: { age: 3600, count: 5000 }, removeOnFail: { age: 86_400 } },
  );
}
