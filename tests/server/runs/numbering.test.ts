import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import type { Workspace } from '../../../server/db/models';
import { makeApiRoster } from '../rosters/fixtures';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

/**
 * Runs are numbered within their roster (issue 20, fix 3): a workspace's first solve is "Run 1"
 * even when other workspaces' runs took the low database ids, and two rosters count apart.
 */
describe('run numbers', () => {
  let db: TestDb;
  let app: Express;

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
  });
  afterAll(async () => {
    await db.drop();
  });

  /** A hand-edited save (a run without the solver): leaves every seat open. */
  const save = async (agent: Agent, rosterId: number) => {
    const roster = (await agent.get(`/api/rosters/${rosterId}`)).body;
    const res = await agent.post(`/api/rosters/${rosterId}/manual-runs`).send({ assignment: {}, version: roster.version });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    return res.body.runId as number;
  };

  it('counts 1, 2, 3 per roster whatever the database ids', async () => {
    const busy = await makeWorkspace('Earlier Hall');
    const early = (await signedIn(app, busy, 'coordinator')).agent;
    const { roster: other } = await makeApiRoster(early, busy);
    for (let i = 0; i < 4; i++) await save(early, other.id);

    const fresh: Workspace = await makeWorkspace('Newcomer Lodge');
    const coordinator = (await signedIn(app, fresh, 'coordinator')).agent;
    const { roster: a } = await makeApiRoster(coordinator, fresh);
    const { roster: b } = await makeApiRoster(coordinator, fresh);
    const a1 = await save(coordinator, a.id);
    const b1 = await save(coordinator, b.id);
    const a2 = await save(coordinator, a.id);
    expect(a1).toBeGreaterThan(4); // the database id is not the number people see

    expect((await coordinator.get(`/api/runs/${a1}`)).body.number).toBe(1);
    expect((await coordinator.get(`/api/runs/${a2}`)).body.number).toBe(2);
    expect((await coordinator.get(`/api/runs/${b1}`)).body.number).toBe(1);
    const list = (await coordinator.get(`/api/rosters/${a.id}/runs`)).body.items as Array<{ id: number; number: number }>;
    expect(Object.fromEntries(list.map((r) => [r.id, r.number]))).toEqual({ [a1]: 1, [a2]: 2 });
    const started = await coordinator.post(`/api/rosters/${b.id}/runs`).send({ timeLimitSeconds: 1 });
    expect(started.status).toBe(202);
    expect(started.body.number).toBe(2);
  });
});
