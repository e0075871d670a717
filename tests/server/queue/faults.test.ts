import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { demoSetup } from '../runs/demo';
import { makeWorkspace, signedIn } from '../auth/helpers';
import { makeApiRoster } from '../rosters/fixtures';
import type { TestDb } from '../helpers/test-db';
import type { Workspace } from '../../../server/db/models';
import { AssignmentRow, Roster, RunRow } from '../../../server/rosters/models';
import { RunWorker } from '../../../server/runs/worker';
import { enqueueRun, queues, runJobId } from '../../../server/queue/queues';
import { startWorkerProcess, type WorkerProcess } from '../../../server/bootstrap/worker-process';
import { runFinished, waitFor } from './helpers';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

/**
 * Faults on the queue, on the Willowmere demo (a roster the solver does not finish early, so a
 * run is still solving when it is killed or cancelled): a worker process killed with -9 mid-run,
 * cancelling a running job, a roster deleted under its job, and the same run enqueued twice.
 */
describe('solve queue: killed worker, cancel while running, deleted roster, duplicate enqueue', () => {
  let db: TestDb;
  let app: Express;
  let workspace: Workspace;
  let coordinator: Agent;
  let rosterId: number;
  let stepper: RunWorker;
  let rescuer: RunWorker | null = null;
  let doomed: WorkerProcess | null = null;

  beforeAll(async () => {
    ({ db, app, workspace, coordinator, worker: stepper } = await demoSetup('faults-stepper'));
    rosterId = (await Roster.findOne({ where: { workspaceId: workspace.id } }))!.id;
  });
  afterAll(async () => {
    await doomed?.stop();
    await rescuer?.stop();
    await stepper.stop();
    await db.drop();
  });

  it('a run whose worker process is killed with -9 mid-solve is retried on another worker and finishes; nothing is lost', { timeout: 180_000 }, async () => {
    // A real `npm run worker` process, with a short lock so its death is noticed within seconds.
    doomed = startWorkerProcess({ ...process.env, NODE_ENV: 'test', ROTALOOM_DB_NAME: db.env.db.database, ROTALOOM_QUEUE_LOCK_MS: '2000' }, { name: 'doomed-worker', log: () => {} });
    const start = await coordinator.post(`/api/rosters/${rosterId}/runs`).send({ timeLimitSeconds: 5, seed: 2 });
    expect(start.status).toBe(202);
    const id = start.body.id as number;
    await waitFor('the run to be solving in the doomed worker', async () => {
      const r = await RunRow.findByPk(id);
      return r?.status === 'running' && r.claimedBy === 'doomed-worker' && r.progress !== null;
    }, 90_000);
    doomed.child.kill('SIGKILL');
    await new Promise((r) => doomed!.child.once('exit', r));

    rescuer = new RunWorker(db.sequelize, { name: 'rescuer', lockMs: 2000 });
    rescuer.start();
    const killedAt = Date.now();
    const row = await runFinished(id, 120_000);
    expect(row.status).toBe('done');
    expect(row.claimedBy).toBe('rescuer');
    expect(row.error).toBeNull();
    // The whole roster came back: one assignment row per seat, and the job says it started twice.
    const seats = (await coordinator.get(`/api/runs/${id}`)).body.assignments.length;
    expect(seats).toBeGreaterThan(100);
    expect(await AssignmentRow.count({ where: { runId: id } })).toBe(seats);
    const job = await queues(db.sequelize).runs.getJob(runJobId(id));
    expect(job?.attemptsStarted).toBe(2);
    console.log(`killed worker: run ${id} finished on the rescuer ${((Date.now() - killedAt) / 1000).toFixed(1)} s after the kill`);
  });

  it('cancels a running job: the solver stops within seconds and keeps the best roster found so far', { timeout: 120_000 }, async () => {
    const start = await coordinator.post(`/api/rosters/${rosterId}/runs`).send({ timeLimitSeconds: 30, seed: 3 });
    const id = start.body.id as number;
    await waitFor('the run to be solving', async () => {
      const r = await RunRow.findByPk(id);
      return r?.status === 'running' && r.progress !== null;
    }, 60_000);
    const cancelledAt = Date.now();
    const cancel = await coordinator.post(`/api/runs/${id}/cancel`).send({});
    expect(cancel.status).toBe(202);
    expect(cancel.body.status).toBe('running');
    expect(cancel.body.cancelRequested).toBe(true);
    const row = await runFinished(id, 60_000);
    const tookMs = Date.now() - cancelledAt;
    expect(row.status).toBe('cancelled');
    expect(row.error).toMatch(/best roster found/);
    // Well before its 30 s limit (the wait includes up to 3 s of marginals after the stop).
    expect(tookMs).toBeLessThan(20_000);
    const body = (await coordinator.get(`/api/runs/${id}`)).body;
    expect(body.assignments.length).toBeGreaterThan(100);
    expect((await coordinator.post(`/api/runs/${id}/cancel`).send({})).status).toBe(409);
    await rescuer!.stop();
    rescuer = null;
  });

  it('a job whose roster was deleted ends cleanly, and enqueueing one run twice keeps one job', { timeout: 120_000 }, async () => {
    const other = await makeWorkspace('Thornbury Lodge');
    const otherCoordinator = (await signedIn(app, other, 'coordinator')).agent;
    const { roster } = await makeApiRoster(otherCoordinator, other);
    const doomedRun = await otherCoordinator.post(`/api/rosters/${roster.id}/runs`).send({ timeLimitSeconds: 1 });
    expect(doomedRun.status).toBe(202);
    expect((await otherCoordinator.delete(`/api/rosters/${roster.id}`)).status).toBe(204);
    expect(await RunRow.findByPk(doomedRun.body.id)).toBeNull();
    // The stepper passes the job over (nothing to solve) and the queue records why.
    expect(await stepper.tick()).toBeNull();
    const hub = queues(db.sequelize);
    const ended = await hub.runs.getJob(runJobId(doomedRun.body.id));
    expect(await ended?.getState()).toBe('completed');
    expect(ended?.returnvalue).toMatchObject({ worked: false, ended: expect.stringMatching(/deleted/) });

    const { roster: kept } = await makeApiRoster(otherCoordinator, other);
    const run = await otherCoordinator.post(`/api/rosters/${kept.id}/runs`).send({ timeLimitSeconds: 1 });
    const row = (await RunRow.findByPk(run.body.id))!;
    await enqueueRun(db.sequelize, row);
    await enqueueRun(db.sequelize, row);
    const waiting = await hub.runs.getJobs(['prioritized', 'waiting', 'delayed']);
    expect(waiting.filter((j) => j.id === runJobId(row.id))).toHaveLength(1);
    expect(await stepper.tick()).toBe(row.id);
    expect(await stepper.tick()).toBeNull();
    // After it finished, one more add changes nothing either: the job is kept, and the row is final.
    await enqueueRun(db.sequelize, row);
    expect(await hub.runs.getJobState(runJobId(row.id))).toBe('completed');
    expect(await stepper.tick()).toBeNull();
    expect((await RunRow.findByPk(row.id))!.status).toBe('done');
  });
});
