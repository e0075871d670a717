import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { Worker, type Job } from 'bullmq';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import { makeApiRoster } from '../rosters/fixtures';
import { AssignmentRow, RunRow } from '../../../server/rosters/models';
import { RunWorker, queueWorkerOptions } from '../../../server/runs/worker';
import { admitRun } from '../../../server/runs/admission';
import { RUNS_QUEUE, queueSettings, queues, runJobId, type RunJobData } from '../../../server/queue/queues';
import { reconcileRuns } from '../../../server/queue/reconcile';
import { waitFor } from './helpers';

/**
 * A job whose worker dies stops having its lock renewed; BullMQ's stall check moves it back to the
 * queue for another worker, and a job stalled more than maxStalledCount times is failed ("job
 * stalled more than allowable limit"; BullMQ docs, guide/workers/stalled-jobs). Here two workers
 * in a row take the same run with the solve workers' own settings and vanish (never renew, never
 * finish), as a process killed with -9 would. The run must come back once; after the second stall
 * BullMQ (5.x) hands the job back marked to fail, and the next solve worker fails it without
 * solving and says so on the row, in words.
 */
describe('solve queue: a run whose worker dies twice is given up, in words', () => {
  let db: TestDb;
  let app: Express;
  const workers: Worker[] = [];
  const running: RunWorker[] = [];
  const LOCK_MS = 1000;

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
  });
  afterAll(async () => {
    await Promise.all(workers.map((w) => w.close(true).catch(() => {})));
    await Promise.all(running.map((w) => w.stop()));
    await db.drop();
  });

  const worker = (name: string) => {
    const { url, prefix } = queueSettings(db.sequelize);
    const w = new Worker<RunJobData>(RUNS_QUEUE, undefined, queueWorkerOptions({ url, prefix, lockMs: LOCK_MS, name, autorun: false }));
    workers.push(w);
    return w;
  };
  /** Takes the next job and marks its run running under this worker's name, as a solve worker does; then nothing more. */
  const takeAndVanish = async (w: Worker<RunJobData>, name: string) => {
    const job = (await w.getNextJob(randomUUID(), { block: false })) as Job<RunJobData> | undefined;
    expect(job).toBeDefined();
    expect(await admitRun(db.sequelize, (await RunRow.findByPk(job!.data.runId))!, name)).toBe(true);
    return job!;
  };

  it('is retried on another worker after the first death, and marked failed with the reason in words after the second', { timeout: 90_000 }, async () => {
    const workspace = await makeWorkspace('Marram Dunes', { plan: 'team' });
    const coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    const { roster } = await makeApiRoster(coordinator, workspace);
    const start = await coordinator.post(`/api/rosters/${roster.id}/runs`).send({ timeLimitSeconds: 1 });
    expect(start.status).toBe(202);
    const id = start.body.id as number;
    const hub = queues(db.sequelize);
    // Some worker must run the stall check: one that takes no jobs itself.
    const checker = worker('stall-checker');
    await checker.waitUntilReady();
    void checker.startStalledCheckTimer();

    const first = await takeAndVanish(worker('vanishing-1'), 'vanishing-1');
    expect(first.id).toBe(runJobId(id));
    expect((await RunRow.findByPk(id))!.claimedBy).toBe('vanishing-1');
    await waitFor('the stalled job to be back in the queue', async () => ['wait', 'waiting', 'prioritized'].includes(await hub.runs.getJobState(runJobId(id))), 30_000, 100);

    // Another worker takes it: the retry after a stall.
    const second = await takeAndVanish(worker('vanishing-2'), 'vanishing-2');
    expect(second.id).toBe(runJobId(id));
    expect((await RunRow.findByPk(id))!.claimedBy).toBe('vanishing-2');
    // Stalled a second time, BullMQ puts it back marked to fail (its `deferredFailure`); the next worker to take it fails it unsolved.
    await waitFor('the twice-stalled job to be marked to fail', async () => (await hub.runs.getJob(runJobId(id)))?.deferredFailure, 30_000, 100);
    const next = new RunWorker(db.sequelize, { name: 'next-worker', lockMs: LOCK_MS, reconcileMs: 600_000 });
    running.push(next);
    next.start();
    await waitFor('the twice-stalled job to fail', async () => (await hub.runs.getJobState(runJobId(id))) === 'failed', 30_000, 100);
    expect((await hub.runs.getJob(runJobId(id)))!.failedReason).toMatch(/stalled more than allowable limit/);
    expect(await AssignmentRow.count({ where: { runId: id } })).toBe(0);

    // The worker that failed it carries the verdict to the row at once, in words (the reconciler would within 10 s).
    const row = await waitFor('the row to say the run was given up', async () => {
      const r = await RunRow.findByPk(id);
      return r?.status === 'failed' ? r : null;
    }, 10_000, 100);
    expect(row.status).toBe('failed');
    expect(row.finishedAt).not.toBeNull();
    expect(row.error).toMatch(/stopped twice before it finished/);
    const seen = await coordinator.get(`/api/runs/${id}`);
    expect(seen.body).toMatchObject({ status: 'failed', error: row.error });
    // Said once: the reconciler finds nothing more to do.
    expect((await reconcileRuns(db.sequelize)).failed).toEqual([]);
  });
});
