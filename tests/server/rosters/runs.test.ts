import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import type { Workspace } from '../../../server/db/models';
import { RunRow } from '../../../server/rosters/models';
import { RunWorker } from '../../../server/runs/worker';
import { assembleRoster } from '../../../server/rosters/assemble';
import { scoreRoster } from '../../../solver/roster';
import { makeApiRoster } from './fixtures';

describe('runs: start, claim, solve, score and cancel', () => {
  let db: TestDb;
  let app: Express;
  let workspace: Workspace;
  let coordinator: Awaited<ReturnType<typeof signedIn>>['agent'];
  let worker: RunWorker;

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    workspace = await makeWorkspace('Hollybank Kitchen');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    worker = new RunWorker(db.sequelize, { name: 'test-worker' });
  });
  afterAll(async () => {
    await worker.stop();
    await db.drop();
  });

  it('solves a tiny roster to the optimum found by exhaustive enumeration, and the scorer agrees', async () => {
    // 3 days × 2 seats = 6 seats, 4 people: 5^6 = 15,625 candidate rosters, few enough to try them all.
    const { roster, people } = await makeApiRoster(coordinator, workspace, {
      people: 4,
      periodStart: '2027-03-01',
      periodEnd: '2027-03-03',
      patterns: [{ label: 'day', weekdays: ['mon', 'tue', 'wed'], startTime: '08:00', endTime: '16:00', seats: [{ skillId: null, count: 2 }] }],
    });
    await coordinator.post(`/api/rosters/${roster.id}/wishes`).send({ personId: people[0].id, date: '2027-03-02', kind: 'avoid', strength: 7 });
    await coordinator.post(`/api/rosters/${roster.id}/wishes`).send({ personId: people[1].id, date: '2027-03-01', kind: 'prefer', strength: 3 });
    await coordinator.post('/api/pairings').send({ personAId: people[2].id, personBId: people[3].id, score: 4 });

    const start = await coordinator.post(`/api/rosters/${roster.id}/runs`).send({ timeLimitSeconds: 5, seed: 3 });
    expect(start.status).toBe(202);
    expect(start.body.status).toBe('queued');
    expect(await worker.tick()).toBe(start.body.id);

    const run = await coordinator.get(`/api/runs/${start.body.id}`);
    expect(run.status).toBe(200);
    expect(run.body.status).toBe('done');
    expect(run.body.assignments).toHaveLength(6);
    expect(run.body.result.feasible).toBe(true);
    // A finished run never changes: its answer (kept in memory) carries an ETag, the same on every
    // read, and a client that sends it back gets 304 with no body (RFC 9110, conditional GET).
    const etag = run.headers.etag as string;
    expect(etag).toMatch(/^W\/"[0-9a-f]+-/);
    const again = await coordinator.get(`/api/runs/${start.body.id}`);
    expect(again.headers.etag).toBe(etag);
    expect(again.body).toEqual(run.body);
    const unchanged = await coordinator.get(`/api/runs/${start.body.id}`).set('If-None-Match', etag);
    expect(unchanged.status).toBe(304);
    expect(unchanged.text ?? '').toBe('');

    // Exact enumeration (independent of the solver): every way to fill the six seats, scored directly.
    const { parsed } = await assembleRoster(workspace.id, roster.id);
    if (!parsed.ok) throw new Error('roster invalid');
    const r = parsed.roster;
    const choices: Array<string | null> = [null, ...r.people.map((p) => p.id)];
    let best = -Infinity;
    const assignment: Record<string, string | null> = {};
    const visit = (i: number) => {
      if (i === r.seats.length) {
        best = Math.max(best, scoreRoster(r, assignment).total);
        return;
      }
      for (const c of choices) {
        assignment[r.seats[i].id] = c;
        visit(i + 1);
      }
    };
    visit(0);
    expect(run.body.score).toBeCloseTo(best, 6);

    // The hand-scoring endpoint gives the same number for the run's own roster.
    const body = Object.fromEntries(run.body.assignments.map((a: { seatId: number; personId: number | null }) => [String(a.seatId), a.personId]));
    const scored = await coordinator.post(`/api/rosters/${roster.id}/score`).send({ assignment: body });
    expect(scored.status).toBe(200);
    expect(scored.body.total).toBeCloseTo(run.body.score, 6);
  });

  it('explains in words why a roster with no shifts cannot be solved', async () => {
    const { roster } = await makeApiRoster(coordinator, workspace, { patterns: [] });
    const res = await coordinator.post(`/api/rosters/${roster.id}/runs`).send({});
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/no shifts/i);
  });

  it('explains in words when a seat needs a skill nobody available has', async () => {
    const { roster, firstAid, people } = await makeApiRoster(coordinator, workspace, {
      people: 2,
      patterns: [{ label: 'late', weekdays: ['tue'], startTime: '14:00', endTime: '22:00', seats: [{ skillId: null, count: 1 }] }],
    });
    // Person A (the only first-aider) cannot work that Tuesday, and the shift now needs first aid.
    const shifts = (await coordinator.get(`/api/rosters/${roster.id}/shifts`)).body.items;
    const upd = await coordinator.patch(`/api/rosters/${roster.id}/shifts/${shifts[0].id}`).send({ version: shifts[0].version, seats: [{ skillId: firstAid.id }] });
    expect(upd.status).toBe(200);
    await coordinator.post(`/api/rosters/${roster.id}/wishes`).send({ personId: people[0].id, date: '2027-03-02', kind: 'cannot' });
    const rules = (await coordinator.get(`/api/rosters/${roster.id}/rules`)).body;
    await coordinator.put(`/api/rosters/${roster.id}/rules`).send({ version: rules.version, rules: { ...rules.rules, coverage: { ...rules.rules.coverage, hard: true } } });
    const res = await coordinator.post(`/api/rosters/${roster.id}/runs`).send({});
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/first aid/i);
  });

  it('cancels a queued run and requeues a run whose worker died', async () => {
    const { roster } = await makeApiRoster(coordinator, workspace);
    const queued = await coordinator.post(`/api/rosters/${roster.id}/runs`).send({ timeLimitSeconds: 1 });
    const cancelled = await coordinator.post(`/api/runs/${queued.body.id}/cancel`).send({});
    expect(cancelled.status).toBe(202);
    expect(cancelled.body.status).toBe('cancelled');
    expect((await coordinator.post(`/api/runs/${queued.body.id}/cancel`).send({})).status).toBe(409);

    // A run left "running" by a process that stopped (old heartbeat) is claimed again and finishes.
    const orphan = await coordinator.post(`/api/rosters/${roster.id}/runs`).send({ timeLimitSeconds: 1 });
    await RunRow.update({ status: 'running', claimedBy: 'a-worker-that-died', heartbeatAt: new Date(Date.now() - 10 * 60_000) }, { where: { id: orphan.body.id } });
    expect(await worker.tick()).toBe(orphan.body.id);
    const done = await coordinator.get(`/api/runs/${orphan.body.id}`);
    expect(done.body.status).toBe('done');
  });

  it('never lets two workers claim the same run', async () => {
    const { roster } = await makeApiRoster(coordinator, workspace);
    const run = await coordinator.post(`/api/rosters/${roster.id}/runs`).send({ timeLimitSeconds: 1 });
    const other = new RunWorker(db.sequelize, { name: 'second-worker' });
    const claimed = await Promise.all([worker.tick(), other.tick()]);
    expect(claimed.filter((id) => id === run.body.id)).toHaveLength(1);
    await other.stop();
  });
});
