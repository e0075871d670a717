import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import { makeApiRoster } from '../rosters/fixtures';
import { RunRow } from '../../../server/rosters/models';
import { RUN_ALLOWANCE } from '../../../server/runs/fair-use';
import { INVITATIONS_PER_DAY } from '../../../server/members/service';

/** Issue 13 item 4: runs waiting or solving, a run's time limit and invitations are bounded per workspace by plan. */
describe('fair use', () => {
  let db: TestDb;
  let app: Express;
  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
  });
  afterAll(async () => {
    await db.drop();
  });

  async function workspaceWithRoster(plan: 'free' | 'team') {
    const workspace = await makeWorkspace(`Fair ${plan}`, { plan });
    const { agent } = await signedIn(app, workspace, 'coordinator');
    const { roster } = await makeApiRoster(agent, workspace);
    return { workspace, agent, rosterId: roster.id };
  }

  it('a Starter workspace starting 20 runs at once gets its allowance queued and clear 429s for the rest', async () => {
    const { workspace, agent, rosterId } = await workspaceWithRoster('free');
    const cap = RUN_ALLOWANCE.free.waitingOrSolving;
    const answers = await Promise.all(Array.from({ length: 20 }, (_, i) => agent.post(`/api/rosters/${rosterId}/runs`).send({ timeLimitSeconds: 1, seed: i })));
    const statuses = answers.map((r) => r.status);
    // closed form: the row lock makes count-and-create one step, so exactly `cap` pass
    expect(statuses.filter((s) => s === 202)).toHaveLength(cap);
    expect(statuses.filter((s) => s === 429)).toHaveLength(20 - cap);
    const refused = answers.find((r) => r.status === 429)!;
    expect(Number(refused.headers['retry-after'])).toBeGreaterThan(0);
    expect(refused.body.error.message).toMatch(/waiting or solving/);
    expect(await RunRow.count({ where: { workspaceId: workspace.id } })).toBe(cap);
    // one ending makes room for one more
    await RunRow.update({ status: 'done' }, { where: { workspaceId: workspace.id, id: answers.find((r) => r.status === 202)!.body.id } });
    expect((await agent.post(`/api/rosters/${rosterId}/runs`).send({ timeLimitSeconds: 1, seed: 99 })).status).toBe(202);
    await RunRow.update({ status: 'cancelled' }, { where: { workspaceId: workspace.id, status: ['queued', 'running'] } });
  });

  it('bounds a run\'s time limit by plan: 402 naming body.timeLimitSeconds on Starter above its limit', async () => {
    const free = await workspaceWithRoster('free');
    const over = await free.agent.post(`/api/rosters/${free.rosterId}/runs`).send({ timeLimitSeconds: RUN_ALLOWANCE.free.maxSeconds + 1, seed: 1 });
    expect(over.status).toBe(402);
    expect(over.body.error.code).toBe('plan_limit');
    expect(over.body.error.fields[0].path).toBe('body.timeLimitSeconds');
    expect(await RunRow.count({ where: { workspaceId: free.workspace.id } })).toBe(0);
    const team = await workspaceWithRoster('team');
    const long = await team.agent.post(`/api/rosters/${team.rosterId}/runs`).send({ timeLimitSeconds: RUN_ALLOWANCE.team.maxSeconds, seed: 1 });
    expect(long.status).toBe(202);
    await RunRow.update({ status: 'cancelled' }, { where: { workspaceId: team.workspace.id } });
  });

  it('limits invitations per workspace per day, counted one by one under simultaneous sends', async () => {
    const workspace = await makeWorkspace('Invite Limit House', { plan: 'free' });
    const { agent } = await signedIn(app, workspace, 'admin');
    const limit = INVITATIONS_PER_DAY.free;
    const answers = await Promise.all(Array.from({ length: limit + 5 }, (_, i) => agent.post('/api/invitations').send({ email: `guest${i}@example.test`, role: 'staff' })));
    expect(answers.filter((r) => r.status === 201)).toHaveLength(limit);
    const refused = answers.filter((r) => r.status === 429);
    expect(refused).toHaveLength(5);
    expect(refused[0].body.error.fields[0].path).toBe('body.email');
    const retryAfter = Number(refused[0].headers['retry-after']);
    expect(retryAfter).toBeGreaterThan(23 * 3600);
    expect(retryAfter).toBeLessThanOrEqual(24 * 3600);
    // a day later the allowance is back
    await db.sequelize.query('UPDATE invitations SET created_at = ? WHERE workspace_id = ?', { replacements: [new Date(Date.now() - 25 * 3600 * 1000), workspace.id] });
    expect((await agent.post('/api/invitations').send({ email: 'late@example.test', role: 'staff' })).status).toBe(201);
  });
});
