import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { agent, makeApp, makePerson, makeUser, makeWorkspace, PASSWORD, signedIn } from '../auth/helpers';

/** Issue 13 item 5: removing a member ends their calendar feeds and sessions in that workspace at once. */
describe('removed means removed', () => {
  let db: TestDb;
  let app: Express;
  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
  });
  afterAll(async () => {
    await db.drop();
  });

  async function staffWithFeed() {
    const workspace = await makeWorkspace('Fernbrook Day Centre');
    const admin = (await signedIn(app, workspace, 'admin')).agent;
    const user = await makeUser({ workspace, role: 'staff' });
    await makePerson(workspace, { name: 'Odile Marchbank', userId: user.id });
    await makePerson(workspace, { name: 'Colleague Tamsin Veer' });
    const staff = agent(app);
    expect((await staff.post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD })).status).toBe(200);
    const feed = await staff.post('/api/me/feed').send({});
    expect(feed.status).toBe(201);
    const path = new URL(feed.body.url).pathname;
    expect((await request(app).get(path)).status).toBe(200);
    return { workspace, admin, user, staff, path };
  }

  it('a removed member\'s feed address answers 404 and their session is gone, on the next request', async () => {
    const { admin, user, staff, path } = await staffWithFeed();
    const sessionsBefore = await db.sequelize.query('SELECT sid FROM sessions WHERE user_id = ?', { replacements: [user.id], plain: false, type: 'SELECT' as never });
    expect(sessionsBefore.length).toBe(1);
    expect((await admin.delete(`/api/members/${user.id}`)).status).toBe(204);
    expect((await request(app).get(path)).status).toBe(404);
    expect((await staff.get('/api/me/shifts')).status).toBe(401);
    expect((await staff.get('/api/auth/session')).body.user).toBeNull();
    const sessionsAfter = await db.sequelize.query('SELECT sid FROM sessions WHERE user_id = ?', { replacements: [user.id], type: 'SELECT' as never });
    expect(sessionsAfter.length).toBe(0);
  });

  it('keeps the member\'s session that works in another workspace', async () => {
    const { workspace, admin, user, path } = await staffWithFeed();
    const other = await makeWorkspace('Kestrel Lane Clinic');
    await db.sequelize.query('INSERT INTO memberships (workspace_id, user_id, role, created_at, updated_at) VALUES (?, ?, ?, NOW(), NOW())', { replacements: [other.id, user.id, 'staff'] });
    const elsewhere = agent(app);
    expect((await elsewhere.post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD })).status).toBe(200);
    expect((await elsewhere.put('/api/workspaces/current').send({ workspaceId: other.id })).status).toBe(200);
    expect((await admin.delete(`/api/members/${user.id}`)).status).toBe(204);
    expect((await request(app).get(path)).status).toBe(404);
    const session = await elsewhere.get('/api/auth/session');
    expect(session.body.workspace).toMatchObject({ id: other.id });
    expect(session.body.workspaces.map((w: { id: number }) => w.id)).not.toContain(workspace.id);
  });

  it('unlinking a member from their person ends the feed made through it', async () => {
    const { admin, user, path } = await staffWithFeed();
    const res = await admin.put(`/api/members/${user.id}/person`).send({ personId: null });
    expect(res.status).toBeLessThan(300);
    expect((await request(app).get(path)).status).toBe(404);
  });
});
