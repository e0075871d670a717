import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

describe('people and skills API: filters, skill counts, deleting a skill, stale edits', () => {
  let db: TestDb;
  let app: Express;
  let coordinator: Agent;
  const skill: Record<string, number> = {};

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    coordinator = (await signedIn(app, await makeWorkspace('Moorside Kitchen'), 'coordinator')).agent;
    for (const name of ['First aid', 'Night lead']) skill[name] = (await coordinator.post('/api/skills').send({ name })).body.id;
    const add = (name: string, email: string | null, skillIds: number[], contractedHours = 30) => coordinator.post('/api/people').send({ name, email, contractedHours, skillIds });
    await add('Ada Quill', 'ada@example.test', [skill['First aid']], 37.5);
    await add('Brin Tallow', null, [skill['First aid'], skill['Night lead']], 20);
    await add('Corra Vane', 'corra@moorside.example', [], 10);
  });
  afterAll(async () => {
    await db.drop();
  });

  it('filters by skill and searches name or e-mail, sorted and paged on the server', async () => {
    const names = async (url: string) => (await coordinator.get(url)).body.items.map((p: { name: string }) => p.name);
    expect(await names(`/api/people?skillId=${skill['First aid']}`)).toEqual(['Ada Quill', 'Brin Tallow']);
    expect(await names(`/api/people?skillId=${skill['Night lead']}`)).toEqual(['Brin Tallow']);
    expect(await names('/api/people?q=moorside')).toEqual(['Corra Vane']);
    expect(await names('/api/people?q=%25')).toEqual([]);
    expect(await names('/api/people?sort=contractedHours&order=desc')).toEqual(['Ada Quill', 'Brin Tallow', 'Corra Vane']);
    const page2 = await coordinator.get('/api/people?pageSize=2&page=2');
    expect(page2.body).toMatchObject({ total: 3, page: 2, pageSize: 2 });
    expect(page2.body.items.map((p: { name: string }) => p.name)).toEqual(['Corra Vane']);
  });

  it('counts the holders of each skill, refuses a duplicate or a ";" in a name', async () => {
    const skills = await coordinator.get('/api/skills');
    expect(skills.body.items).toEqual([
      { id: skill['First aid'], name: 'First aid', people: 2 },
      { id: skill['Night lead'], name: 'Night lead', people: 1 },
    ]);
    const dup = await coordinator.post('/api/skills').send({ name: 'First aid' });
    expect(dup.status).toBe(409);
    const semi = await coordinator.post('/api/skills').send({ name: 'Tea;coffee' });
    expect(semi.status).toBe(400);
    expect(semi.body.error.fields[0].path).toBe('body.name');
    const renameClash = await coordinator.patch(`/api/skills/${skill['Night lead']}`).send({ name: 'First aid' });
    expect(renameClash.status).toBe(409);
  });

  it('takes a deleted skill off everyone who held it and moves their version on', async () => {
    const brin = (await coordinator.get('/api/people?q=brin')).body.items[0];
    expect((await coordinator.delete(`/api/skills/${skill['Night lead']}`)).status).toBe(204);
    const after = (await coordinator.get(`/api/people/${brin.id}`)).body;
    expect(after.skillIds).toEqual([skill['First aid']]);
    expect(after.version).toBe(brin.version + 1);
    const stale = await coordinator.patch(`/api/people/${brin.id}`).send({ name: 'Brin T.', version: brin.version });
    expect(stale.status).toBe(409);
    expect(stale.body.error.message).toMatch(/Someone else changed this person/);
    expect((await coordinator.get(`/api/people/${brin.id}`)).body.name).toBe('Brin Tallow');
  });

  it("answers 404 to another workspace's coordinator for a person, with a valid body, and changes nothing", async () => {
    const brin = (await coordinator.get('/api/people?q=brin')).body.items[0];
    const stranger = (await signedIn(app, await makeWorkspace('Elsewhere'), 'coordinator')).agent;
    const res = await stranger.patch(`/api/people/${brin.id}`).send({ name: 'Taken over', version: brin.version });
    expect(res.status).toBe(404);
    expect((await stranger.get(`/api/people/${brin.id}`)).status).toBe(404);
    expect((await stranger.delete(`/api/people/${brin.id}`)).status).toBe(404);
    expect((await coordinator.get(`/api/people/${brin.id}`)).body).toMatchObject({ name: 'Brin Tallow', version: brin.version });
  });
});
