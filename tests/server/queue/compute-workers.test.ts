import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Worker } from 'bullmq';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import { makeApiRoster } from '../rosters/fixtures';
import { seatsOf } from '../staff/publish-helper';
import { AssignmentRow, Roster, RunRow } from '../../../server/rosters/models';
import { RunWorker } from '../../../server/runs/worker';
import { COMPUTE_QUEUE, NO_WORKER_RETRY_AFTER_S, queueSettings } from '../../../server/queue/queues';
import { workerOptions } from '../../../server/queue/connection';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

/**
 * Compute requests (seat alternatives, a concession's price) wait for a worker's answer. With no
 * worker serving the compute queue they answer at once with 503 Service Unavailable and a
 * Retry-After (RFC 9110 §15.6.4 and §10.2.3), instead of holding the request for minutes.
 */
describe('compute jobs when no worker is there to take them', () => {
  let db: TestDb;
  let app: Express;
  let coordinator: Agent;
  let alternativesUrl: string;
  let priceUrl: string;
  let worker: RunWorker | null = null;

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    const workspace = await makeWorkspace('Larkspur Yard');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    const fixture = await makeApiRoster(coordinator, workspace, { people: 4 });
    const seats = await seatsOf(workspace.id, fixture.roster.id);
    const roster = (await Roster.findByPk(fixture.roster.id))!;
    const run = await RunRow.create({ workspaceId: workspace.id, rosterId: roster.id, status: 'done', parameters: { timeLimitSeconds: 1, seed: 1 }, rosterVersion: roster.version, result: { feasible: true } as object, finishedAt: new Date() });
    await AssignmentRow.bulkCreate(seats.map((s, i) => ({ workspaceId: workspace.id, runId: run.id, seatId: s.seatId, personId: fixture.people[i % 2].id, pinned: false })));
    alternativesUrl = `/api/runs/${run.id}/seats/${seats[0].seatId}/alternatives`;
    priceUrl = `/api/runs/${run.id}/concession-price`;
  });
  afterAll(async () => {
    await worker?.stop();
    await db.drop();
  });

  const expectNoWorker = (res: { status: number; headers: Record<string, string>; body: { error?: { code?: string; message?: string } } }) => {
    expect(res.status).toBe(503);
    expect(res.headers['retry-after']).toBe(String(NO_WORKER_RETRY_AFTER_S));
    expect(res.headers['content-type']).toMatch(/application\/json/);
    expect(res.body.error?.code).toBe('unavailable');
    expect(res.body.error?.message).toMatch(/No solve worker is running/);
  };

  it('answers 503 with Retry-After at once, for alternatives and for a price, and the answer once a worker runs', { timeout: 120_000 }, async () => {
    let t = Date.now();
    const alternatives = await coordinator.get(alternativesUrl);
    expectNoWorker(alternatives);
    expect(alternatives.body.error.message).toMatch(/the alternatives for this seat/);
    expect(Date.now() - t).toBeLessThan(3000);
    t = Date.now();
    const price = await coordinator.post(priceUrl).send({ index: 0, timeLimitSeconds: 1, seed: 1 });
    // The concession itself is looked at by the worker, so with none running the price is the same 503.
    expectNoWorker(price);
    expect(price.body.error.message).toMatch(/the price of this concession/);
    expect(Date.now() - t).toBeLessThan(3000);

    worker = new RunWorker(db.sequelize, { name: 'compute-only' });
    worker.startCompute();
    await worker.ready();
    const answered = await coordinator.get(alternativesUrl);
    expect(answered.status).toBe(200);
    await worker.stop();
    worker = null;
    expectNoWorker(await coordinator.get(alternativesUrl));
  });

  it('a request whose job still waits when the last worker goes away is answered 503 within seconds', { timeout: 60_000 }, async () => {
    // A worker that is connected (so it is counted) but never takes a job, then leaves.
    const { url, prefix } = queueSettings(db.sequelize);
    const idle = new Worker(COMPUTE_QUEUE, undefined, { connection: workerOptions(url), prefix, autorun: false, name: 'idle' });
    await idle.waitUntilReady();
    const t = Date.now();
    const pending = coordinator.get(alternativesUrl).then((res) => res);
    await new Promise((r) => setTimeout(r, 1000));
    await idle.close();
    const res = await pending;
    expectNoWorker(res);
    // One check period (3 s) after the worker left, plus the request's own time; not the 150 s timeout.
    expect(Date.now() - t).toBeLessThan(10_000);
    expect(await RunRow.count()).toBe(1);
  });
});
