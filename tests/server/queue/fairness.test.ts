import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import { makeApiRoster } from '../rosters/fixtures';
import { RunRow } from '../../../server/rosters/models';
import { RunWorker } from '../../../server/runs/worker';
import { admitRun } from '../../../server/runs/admission';
import { ACTIVE_RUN_CAPS } from '../../../server/billing/limits';
import { runFinished, waitFor, watchRuns } from './helpers';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

async function workspaceWithRoster(app: Express, name: string, plan: 'free' | 'team') {
  const workspace = await makeWorkspace(name, { plan });
  const coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
  const { roster } = await makeApiRoster(coordinator, workspace);
  return { workspace, coordinator, rosterId: roster.id };
}

const startRun = async (coordinator: Agent, rosterId: number, seed: number) => {
  const res = await coordinator.post(`/api/rosters/${rosterId}/runs`).send({ timeLimitSeconds: 1, seed });
  expect(res.status).toBe(202);
  return res.body.id as number;
};

describe('solve queue: caps per plan and fairness between workspaces', () => {
  let db: TestDb;
  let app: Express;
  const workers: RunWorker[] = [];

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
  });
  afterAll(async () => {
    await Promise.all(workers.map((w) => w.stop()));
    await db.drop();
  });

  it('admits runs up to the plan’s cap of runs at once (Starter 1, Team 3), and the next once one ends', async () => {
    expect(ACTIVE_RUN_CAPS).toEqual({ free: 1, team: 3 });
    const free = await workspaceWithRoster(app, 'Cap Starter', 'free');
    const team = await workspaceWithRoster(app, 'Cap Team', 'team');
    const freeRuns = [await startRun(free.coordinator, free.rosterId, 1), await startRun(free.coordinator, free.rosterId, 2)];
    const teamRuns: number[] = [];
    for (let i = 0; i < 4; i++) teamRuns.push(await startRun(team.coordinator, team.rosterId, i));
    const admit = async (id: number) => admitRun(db.sequelize, (await RunRow.findByPk(id))!, 'cap-test');
    // Two workers asking at the same moment for the Starter workspace: exactly one gets a run.
    expect((await Promise.all(freeRuns.map(admit))).filter(Boolean)).toHaveLength(1);
    const admittedTeam = await Promise.all(teamRuns.map(admit));
    expect(admittedTeam.filter(Boolean)).toHaveLength(3);
    // A run that ends frees its place.
    const freeRunning = (await RunRow.findAll({ where: { id: freeRuns, status: 'running' } }))[0];
    await RunRow.update({ status: 'done' }, { where: { id: freeRunning.id } });
    const freeWaiting = freeRuns.find((id) => id !== freeRunning.id)!;
    expect(await admit(freeWaiting)).toBe(true);
    // Left as they are, these would wait for workers below; they are settled here.
    await RunRow.update({ status: 'cancelled' }, { where: { id: [...freeRuns, ...teamRuns] } });
  });

  it('with two workers, a Starter workspace’s two runs are still solved one after the other', { timeout: 120_000 }, async () => {
    const free = await workspaceWithRoster(app, 'Two Workers Starter', 'free');
    const ids = [await startRun(free.coordinator, free.rosterId, 3), await startRun(free.coordinator, free.rosterId, 4)];
    const watch = watchRuns(() => ids);
    for (const name of ['cap-worker-1', 'cap-worker-2']) {
      const w = new RunWorker(db.sequelize, { name, capDelayMs: 300 });
      w.start();
      workers.push(w);
    }
    for (const id of ids) expect((await runFinished(id)).status).toBe('done');
    await watch.stop();
    expect(watch.maxAtOnce.get(free.workspace.id)).toBe(1);
    await Promise.all(workers.splice(0).map((w) => w.stop()));
  });

  it('a workspace flooding the queue does not hold back another’s first run by more than one run', { timeout: 240_000 }, async () => {
    const flood = await workspaceWithRoster(app, 'Flood House', 'team');
    const quiet = await workspaceWithRoster(app, 'Quiet Cottage', 'team');
    const floodIds: number[] = [];
    for (let i = 0; i < 5; i++) floodIds.push(await startRun(flood.coordinator, flood.rosterId, 10 + i));
    const ids = [...floodIds];
    const watch = watchRuns(() => ids);
    const worker = new RunWorker(db.sequelize, { name: 'fair-worker' });
    worker.start();
    workers.push(worker);
    await waitFor('the first flood run to start', async () => watch.firstRunning.has(floodIds[0]), 60_000, 50);
    const quietQueuedAt = Date.now();
    const quietId = await startRun(quiet.coordinator, quiet.rosterId, 1);
    ids.push(quietId);
    for (const id of ids) expect((await runFinished(id, 180_000)).status).toBe('done');
    await watch.stop();

    // One worker, so runs start one at a time; the quiet workspace's run is the next to start after
    // the flood run that was solving when it was queued, ahead of the four flood runs queued before it.
    const order = [...watch.firstRunning.entries()].sort((a, b) => a[1] - b[1]).map(([id]) => id);
    expect(order.indexOf(quietId)).toBe(1);
    const waitedMs = watch.firstRunning.get(quietId)! - quietQueuedAt;
    const firstRunMs = watch.firstRunning.get(floodIds[1])! - watch.firstRunning.get(floodIds[0])!;
    console.log(`fairness: the quiet workspace waited ${waitedMs} ms behind a flood of 5; one flood run took about ${firstRunMs} ms from start to the next start`);
    expect(waitedMs).toBeLessThanOrEqual(firstRunMs);
  });
});
