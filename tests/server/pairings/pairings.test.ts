import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makePerson, makeWorkspace, signedIn } from '../auth/helpers';
import { PairingRow } from '../../../server/rosters/models';
import type { Workspace } from '../../../server/db/models';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

describe('pairings API for coordinators: table, search, inline edits and staff requests', () => {
  let db: TestDb;
  let app: Express;
  let workspace: Workspace;
  let coordinator: Agent;
  const people: Record<string, number> = {};

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    workspace = await makeWorkspace('Fernhill Lab');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    for (const name of ['Ada Quill', 'Brin Tallow', 'Corra Vane', 'Dell Moss']) people[name] = (await makePerson(workspace, { name })).id;
  });
  afterAll(async () => {
    await db.drop();
  });

  it('lists pairings with both names, searchable by either name', async () => {
    const made = await coordinator.post('/api/pairings').send({ personAId: people['Brin Tallow'], personBId: people['Ada Quill'], score: 4 });
    expect(made.status).toBe(201);
    expect(made.body).toMatchObject({ personAName: 'Ada Quill', personBName: 'Brin Tallow', score: 4, neverTogether: false, status: 'approved' });
    await coordinator.post('/api/pairings').send({ personAId: people['Corra Vane'], personBId: people['Dell Moss'], score: 0, neverTogether: true });
    const all = await coordinator.get('/api/pairings');
    expect(all.body.items.map((p: { personAName: string; personBName: string }) => `${p.personAName} + ${p.personBName}`)).toEqual(['Ada Quill + Brin Tallow', 'Corra Vane + Dell Moss']);
    const found = await coordinator.get('/api/pairings?q=moss');
    expect(found.body.items).toHaveLength(1);
    expect(found.body.items[0]).toMatchObject({ personBName: 'Dell Moss', neverTogether: true });
    expect((await coordinator.get('/api/pairings?q=nobody')).body.items).toEqual([]);
    expect((await coordinator.get('/api/pairings?status=maybe')).status).toBe(400);
  });

  it('edits a score inline with the version seen, and refuses a stale edit with 409 keeping the newer one', async () => {
    const list = await coordinator.get('/api/pairings?q=ada');
    const p = list.body.items[0];
    const ok = await coordinator.patch(`/api/pairings/${p.id}`).send({ score: -3, version: p.version });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ score: -3, version: p.version + 1, personAName: 'Ada Quill' });
    const stale = await coordinator.patch(`/api/pairings/${p.id}`).send({ score: 9, version: p.version });
    expect(stale.status).toBe(409);
    expect(stale.body.error.message).toMatch(/Someone else changed this pairing/);
    expect(stale.body.error.fields[0].path).toBe('body.version');
    expect((await coordinator.get('/api/pairings?q=ada')).body.items[0].score).toBe(-3);
  });

  it('shows staff requests with their reason, and approving one makes it reach the solver input', async () => {
    // A staff member's request as the staff side (issue 7) stores it: status requested, with a reason.
    const request = await PairingRow.create({ workspaceId: workspace.id, personAId: people['Ada Quill'], personBId: people['Corra Vane'], score: 3, status: 'requested', reason: 'Corra is showing me the medication round', requestedByPersonId: people['Ada Quill'] });
    const declined = await PairingRow.create({ workspaceId: workspace.id, personAId: people['Brin Tallow'], personBId: people['Dell Moss'], score: -2, status: 'requested', reason: 'We disagree about breaks' });
    const requested = await coordinator.get('/api/pairings?status=requested');
    expect(requested.body.items).toEqual([
      expect.objectContaining({ id: request.id, personAName: 'Ada Quill', personBName: 'Corra Vane', status: 'requested', reason: 'Corra is showing me the medication round', score: 3, requestedByName: 'Ada Quill' }),
      expect.objectContaining({ id: declined.id, personAName: 'Brin Tallow', personBName: 'Dell Moss', reason: 'We disagree about breaks' }),
    ]);

    const roster = await coordinator.post('/api/rosters').send({ name: 'Week', periodStart: '2027-03-01', periodEnd: '2027-03-07', timeZone: 'Europe/London' });
    const pairsInModel = async () => ((await coordinator.get(`/api/rosters/${roster.body.id}/export`)).body.pairings as Array<{ a: string; b: string }>).map((p) => `${p.a}-${p.b}`);
    const key = `p${people['Ada Quill']}-p${people['Corra Vane']}`;
    expect(await pairsInModel()).not.toContain(key);

    const approve = await coordinator.patch(`/api/pairings/${request.id}`).send({ status: 'approved', version: request.version });
    expect(approve.status).toBe(200);
    expect(approve.body).toMatchObject({ status: 'approved', reason: 'Corra is showing me the medication round' });
    expect(await pairsInModel()).toContain(key);

    const decline = await coordinator.patch(`/api/pairings/${declined.id}`).send({ status: 'declined', version: declined.version });
    expect(decline.status).toBe(200);
    expect(await pairsInModel()).not.toContain(`p${people['Brin Tallow']}-p${people['Dell Moss']}`);
    expect((await coordinator.get('/api/pairings?status=requested')).body.items).toEqual([]);
    expect((await coordinator.get('/api/pairings?status=declined')).body.items.map((p: { id: number }) => p.id)).toEqual([declined.id]);
    // Approving twice from two screens: the second sees a conflict, not a silent overwrite.
    expect((await coordinator.patch(`/api/pairings/${request.id}`).send({ status: 'declined', version: request.version })).status).toBe(409);
  });

  it("shows a request made through the staff side's own route, and the staff member sees the decision", async () => {
    const { agent: staff, user } = await signedIn(app, workspace, 'staff');
    const me = await makePerson(workspace, { name: 'Evan Pell', userId: user.id });
    const asked = await staff.post('/api/me/pairings').send({ colleagueId: people['Dell Moss'], together: false, reason: 'We clash on handovers' });
    expect(asked.status).toBe(201);
    const seen = (await coordinator.get('/api/pairings?status=requested')).body.items.find((p: { personAId: number; personBId: number }) => [p.personAId, p.personBId].includes(me.id));
    expect(seen).toMatchObject({ personAName: 'Dell Moss', personBName: 'Evan Pell', reason: 'We clash on handovers', requestedByName: 'Evan Pell', status: 'requested' });
    expect(seen.score).toBeLessThan(0);
    const approved = await coordinator.patch(`/api/pairings/${seen.id}`).send({ status: 'approved', score: -5, version: seen.version });
    expect(approved.status).toBe(200);
    expect(approved.body).toMatchObject({ status: 'approved', score: -5 });
    const mine = await staff.get('/api/me/pairings');
    expect(JSON.stringify(mine.body)).toContain('approved');
  });

  it('deletes a pairing; another workspace cannot see, edit or delete it', async () => {
    const other = await makeWorkspace('Elsewhere');
    const stranger = (await signedIn(app, other, 'coordinator')).agent;
    const p = (await coordinator.get('/api/pairings?q=dell')).body.items[0];
    expect((await stranger.get('/api/pairings')).body.items).toEqual([]);
    expect((await stranger.patch(`/api/pairings/${p.id}`).send({ score: 1, version: p.version })).status).toBe(404);
    expect((await stranger.delete(`/api/pairings/${p.id}`)).status).toBe(404);
    expect((await coordinator.delete(`/api/pairings/${p.id}`)).status).toBe(204);
    expect((await coordinator.delete(`/api/pairings/${p.id}`)).status).toBe(404);
  });

  it('keeps staff out of the coordinator pairing list (scores and reasons are for coordinators)', async () => {
    const staff = (await signedIn(app, workspace, 'staff')).agent;
    expect((await staff.get('/api/pairings')).status).toBe(403);
    expect((await staff.get('/api/pairings?status=requested')).status).toBe(403);
  });
});
