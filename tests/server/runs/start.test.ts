import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import type { Workspace } from '../../../server/db/models';
import { Roster, RunRow } from '../../../server/rosters/models';
import { RunWorker } from '../../../server/runs/worker';
import { assembleValidRoster } from '../../../server/rosters/assemble';
import { loadRunRoster } from '../../../server/runs/repository';
import { makeApiRoster } from '../rosters/fixtures';
import { enqueueRun } from '../../../server/queue/queues';

/**
 * One path from "start a run" to the solver (issue 16): the roster is assembled and checked once,
 * when the run is started, and the worker solves exactly that roster.
 */
describe('runs: the roster is assembled and checked once, when the run starts', () => {
  let db: TestDb;
  let app: Express;
  let workspace: Workspace;
  let coordinator: Awaited<ReturnType<typeof signedIn>>['agent'];
  let worker: RunWorker;

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    workspace = await makeWorkspace('Pennyfield Court');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    worker = new RunWorker(db.sequelize, { name: 'start-test-worker' });
  });
  afterAll(async () => {
    await worker.stop();
    await db.drop();
  });

  const oneSeat = { people: 2, periodStart: '2027-03-01', periodEnd: '2027-03-01', patterns: [{ label: 'day', weekdays: ['mon'], startTime: '08:00', endTime: '16:00', seats: [{ skillId: null, count: 1 }] }] };

  it('keeps the checked roster with the run, and the worker solves that roster, not the one edited since', async () => {
    const { roster, people } = await makeApiRoster(coordinator, workspace, oneSeat);
    const [a, b] = people;
    expect((await coordinator.post(`/api/rosters/${roster.id}/wishes`).send({ personId: a.id, date: '2027-03-01', kind: 'prefer', strength: 5 })).status).toBe(201);
    const assembled = await assembleValidRoster(workspace.id, roster.id);
    const start = await coordinator.post(`/api/rosters/${roster.id}/runs`).send({ timeLimitSeconds: 2, seed: 1 });
    expect(start.status).toBe(202);
    expect(await loadRunRoster(start.body.id)).toEqual(assembled.roster);
    expect(start.body.rosterVersion).toBe(assembled.version);

    // An edit after the start: A cannot work the only seat. A worker that assembled the roster
    // again would give it to B; the run solves the roster it was started with, where A's
    // wish (+5 by hand: one seat, two otherwise equal people) makes A the only best answer.
    expect((await coordinator.post(`/api/rosters/${roster.id}/wishes`).send({ personId: a.id, date: '2027-03-01', kind: 'cannot' })).status).toBe(201);
    expect(await worker.tick()).toBe(start.body.id);
    const run = (await coordinator.get(`/api/runs/${start.body.id}`)).body;
    expect(run.status).toBe('done');
    expect(run.assignments.map((x: { personId: number | null }) => x.personId)).toEqual([a.id]);
    expect(run.assignments[0].personId).not.toBe(b.id);
    // The result is of an older version: the roster stays a draft, as after any edit.
    expect((await coordinator.get(`/api/rosters/${roster.id}`)).body.status).toBe('draft');

    // The next run sees the edit.
    const next = await coordinator.post(`/api/rosters/${roster.id}/runs`).send({ timeLimitSeconds: 2, seed: 1 });
    expect(next.status).toBe(202);
    expect(await worker.tick()).toBe(next.body.id);
    expect((await coordinator.get(`/api/runs/${next.body.id}`)).body.assignments.map((x: { personId: number | null }) => x.personId)).toEqual([b.id]);
  });

  it('refuses to start a run the checks can already refuse, and writes no run', async () => {
    const { roster } = await makeApiRoster(coordinator, workspace, { ...oneSeat, patterns: [] });
    const before = await RunRow.count({ where: { workspaceId: workspace.id } });
    const res = await coordinator.post(`/api/rosters/${roster.id}/runs`).send({ timeLimitSeconds: 2 });
    expect(res.status).toBe(422);
    expect(res.body.error.fields).toEqual([{ path: 'roster.shifts', message: 'no shifts' }]);
    expect(await RunRow.count({ where: { workspaceId: workspace.id } })).toBe(before);
  });

  it('prepares a run written without its roster (before rosters were kept with runs) when it is solved, in the same way', async () => {
    const { roster } = await makeApiRoster(coordinator, workspace, oneSeat);
    const version = (await Roster.findByPk(roster.id))!.version;
    const legacy = await RunRow.create({ workspaceId: workspace.id, rosterId: roster.id, parameters: { timeLimitSeconds: 2, seed: 1 }, rosterVersion: version, status: 'queued', cancelRequested: false });
    expect(await loadRunRoster(legacy.id)).toBeNull();
    await enqueueRun(db.sequelize, legacy);
    expect(await worker.tick()).toBe(legacy.id);
    const done = (await coordinator.get(`/api/runs/${legacy.id}`)).body;
    expect(done.status).toBe('done');
    expect(done.assignments).toHaveLength(1);
    expect(done.assignments[0].personId).not.toBeNull();

    // The same checks: a roster that lost its shifts fails in the words the start would have given.
    const empty = await makeApiRoster(coordinator, workspace, { ...oneSeat, patterns: [] });
    const doomed = await RunRow.create({ workspaceId: workspace.id, rosterId: empty.roster.id, parameters: { timeLimitSeconds: 2, seed: 1 }, rosterVersion: 1, status: 'queued', cancelRequested: false });
    await enqueueRun(db.sequelize, doomed);
    expect(await worker.tick()).toBe(doomed.id);
    const failed = (await RunRow.findByPk(doomed.id))!;
    expect(failed.status).toBe('failed');
    expect(failed.error).toBe('This roster has no shifts yet: add a shift pattern or a shift first.');
  });
});
