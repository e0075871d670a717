import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import { makeApiRoster } from '../rosters/fixtures';
import type { Workspace } from '../../../server/db/models';
import { RunRow } from '../../../server/rosters/models';
import { RunWorker } from '../../../server/runs/worker';
import { reconcileRuns } from '../../../server/queue/reconcile';
import { queues, requireQueue, runJobId } from '../../../server/queue/queues';
import { startRedis, type RedisServer } from '../../../server/bootstrap/redis';
import { freePort } from '../../../server/bootstrap/mariadb';
import { waitFor } from './helpers';

/**
 * Redis going away and coming back, on a Redis of this file's own (the shared test Redis must
 * stay up for the other files): starting a run while it is down answers 503 with Retry-After and
 * writes nothing; a run row written meanwhile (its add lost) is enqueued by the reconciler once
 * Redis is back, and the job queued before the outage survives the restart (append-only file).
 */
describe('solve queue: Redis down and restarted', () => {
  let dir: string;
  let port: number;
  let redis: RedisServer;
  let db: TestDb;
  let app: Express;
  let workspace: Workspace;
  let coordinator: Awaited<ReturnType<typeof signedIn>>['agent'];
  let worker: RunWorker;

  beforeAll(async () => {
    dir = mkdtempSync(path.join(os.tmpdir(), 'rotaloom-redis-restart-'));
    port = await freePort();
    redis = await startRedis({ dataDir: dir, port, log: () => {} });
    db = await createTestDb({ ROTALOOM_REDIS_URL: redis.url });
    app = makeApp(db).app;
    workspace = await makeWorkspace('Ashdown Court');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    worker = new RunWorker(db.sequelize, { name: 'after-restart', redisUrl: redis.url });
  });
  afterAll(async () => {
    await worker.stop();
    await db.drop();
    await redis.stop();
    rmSync(dir, { recursive: true, force: true });
  });

  it('answers 503 with Retry-After while Redis is down, and the reconciler enqueues what was written meanwhile', { timeout: 120_000 }, async () => {
    const { roster } = await makeApiRoster(coordinator, workspace);
    const before = await coordinator.post(`/api/rosters/${roster.id}/runs`).send({ timeLimitSeconds: 1 });
    expect(before.status).toBe(202);
    expect(await queues(db.sequelize).runs.getJobState(runJobId(before.body.id))).not.toBe('unknown');

    await redis.stop();
    const refused = await coordinator.post(`/api/rosters/${roster.id}/runs`).send({ timeLimitSeconds: 1 });
    expect(refused.status).toBe(503);
    expect(refused.headers['retry-after']).toBe('5');
    expect(refused.body.error.code).toBe('unavailable');
    expect(refused.body.error.message).toMatch(/nothing was started/);
    expect(await RunRow.count({ where: { workspaceId: workspace.id } })).toBe(1);
    // What a commit followed by a lost add leaves behind: a queued row with no job.
    const first = (await RunRow.findByPk(before.body.id))!;
    const orphan = await RunRow.create({ workspaceId: workspace.id, rosterId: roster.id, parameters: first.parameters, rosterVersion: first.rosterVersion, status: 'queued', cancelRequested: false });

    redis = await startRedis({ dataDir: dir, port, log: () => {} });
    await waitFor('the API to reach Redis again', () => requireQueue(db.sequelize).then(() => true, () => false), 30_000, 200);
    const report = await reconcileRuns(db.sequelize);
    // The first run's job came back with Redis's append-only file; only the orphan needed a job.
    expect(report.enqueued).toEqual([orphan.id]);
    expect((await reconcileRuns(db.sequelize)).enqueued).toEqual([]);

    expect(await worker.tick()).toBe(before.body.id);
    expect(await worker.tick()).toBe(orphan.id);
    for (const id of [before.body.id, orphan.id]) expect((await RunRow.findByPk(id))!.status).toBe('done');
    const again = await coordinator.post(`/api/rosters/${roster.id}/runs`).send({ timeLimitSeconds: 1 });
    expect(again.status).toBe(202);
  });
});
