import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { PASSWORD, agent, makeApp, makeUser, makeWorkspace } from './helpers';
import { SignInAttempt } from '../../../server/auth/models';

describe('password sign-in, session and sign-out', () => {
  let db: TestDb;
  let app: ReturnType<typeof makeApp>['app'];
  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
  });
  afterAll(async () => {
    await db.drop();
  });

  it('signs in, returns the session shape, and GET /session answers the same until sign-out', async () => {
    const workspace = await makeWorkspace('Harbour Clinic');
    const user = await makeUser({ workspace, role: 'coordinator', displayName: 'Ines Calloway' });
    const a = agent(app);
    const res = await a.post('/api/auth/sign-in').send({ email: user.email.toUpperCase(), password: PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({
      user: { id: user.id, email: user.email, displayName: 'Ines Calloway' },
      workspace: { id: workspace.id, name: 'Harbour Clinic' },
      role: 'coordinator',
      workspaces: [{ id: workspace.id, name: 'Harbour Clinic', role: 'coordinator' }],
    });
    const cookie = res.headers['set-cookie'][0] as string;
    expect(cookie).toMatch(/^rotaloom\.sid=/);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect(cookie).not.toMatch(/Secure/i);

    const session = await a.get('/api/auth/session');
    expect(session.status).toBe(200);
    expect(session.body).toEqual(res.body);

    expect((await a.post('/api/auth/sign-out').send({})).status).toBe(204);
    expect((await a.get('/api/auth/session')).body.user).toBeNull();
  });

  it('treats a session row past its expiry as signed out, and a deleted account too', async () => {
    // express-session trusts the store to say which sessions still exist; the row's `expires`
    // is the server's record, so a stolen cookie of an expired session must not work.
    const workspace = await makeWorkspace();
    const user = await makeUser({ workspace, role: 'coordinator' });
    const a = agent(app);
    expect((await a.post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD })).status).toBe(200);
    expect((await a.get('/api/people')).status).toBe(200);
    await db.sequelize.query('UPDATE sessions SET expires = ? WHERE user_id = ?', { replacements: [new Date(Date.now() - 1000), user.id] });
    // A change made behind the server's back (not through a request) shows within a second: reads
    // of one session share a lookup for that long (server/auth/session-cache.ts).
    await new Promise((r) => setTimeout(r, 1100));
    expect((await a.get('/api/auth/session')).body.user).toBeNull();
    expect((await a.get('/api/people')).status).toBe(401);

    const b = agent(app);
    expect((await b.post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD })).status).toBe(200);
    await user.destroy();
    expect((await b.get('/api/auth/session')).body.user).toBeNull();
  });

  it('a member removed by an admin loses access on their very next request, despite the session cache', async () => {
    const workspace = await makeWorkspace();
    const admin = await makeUser({ workspace, role: 'admin' });
    const member = await makeUser({ workspace, role: 'coordinator' });
    const a = agent(app);
    const m = agent(app);
    expect((await a.post('/api/auth/sign-in').send({ email: admin.email, password: PASSWORD })).status).toBe(200);
    expect((await m.post('/api/auth/sign-in').send({ email: member.email, password: PASSWORD })).status).toBe(200);
    // two reads in a row: the second comes from the cache
    expect((await m.get('/api/people')).status).toBe(200);
    expect((await m.get('/api/people')).status).toBe(200);
    expect((await a.delete(`/api/members/${member.id}`)).status).toBeLessThan(300);
    expect((await m.get('/api/people')).status).not.toBe(200);
    expect((await m.get('/api/auth/session')).body.role ?? null).toBeNull();
  });

  it('gives a new session id at each sign-in, so a planted session cookie is worthless', async () => {
    const user = await makeUser({ workspace: await makeWorkspace() });
    const a = agent(app);
    const sid = (res: { headers: Record<string, unknown> }) => /rotaloom\.sid=([^;]+)/.exec(String((res.headers['set-cookie'] as string[])[0]))?.[1];
    const first = sid(await a.post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD }));
    const second = sid(await a.post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD }));
    expect(first).toBeTruthy();
    expect(second).toBeTruthy();
    expect(second).not.toBe(first);
  });

  it('marks the cookie Secure when the request came over HTTPS (through the loopback proxy)', async () => {
    const user = await makeUser({ workspace: await makeWorkspace() });
    const res = await request(app).post('/api/auth/sign-in').set('X-Rotaloom-CSRF', '1').set('X-Forwarded-Proto', 'https').send({ email: user.email, password: PASSWORD });
    expect(res.status).toBe(200);
    expect(res.headers['set-cookie'][0]).toMatch(/; Secure/i);
  });

  it('answers an unknown e-mail and a wrong password with the same 401 message', async () => {
    const user = await makeUser({ workspace: await makeWorkspace() });
    const wrong = await agent(app).post('/api/auth/sign-in').send({ email: user.email, password: 'not the password' });
    const unknown = await agent(app).post('/api/auth/sign-in').send({ email: 'nobody-here@example.test', password: 'not the password' });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual(unknown.body);
    expect(wrong.body.error.fields[0].path).toBe('body.password');
    expect(wrong.headers['set-cookie']).toBeUndefined();
  });

  it('rejects malformed and over-long bodies with 400 naming the field', async () => {
    const a = agent(app);
    const missing = await a.post('/api/auth/sign-in').send({ password: 'x' });
    expect(missing.status).toBe(400);
    expect(missing.body.error.fields.map((f: { path: string }) => f.path)).toEqual(['body.email']);
    const long = await a.post('/api/auth/sign-in').send({ email: 'a@example.test', password: 'x'.repeat(201) });
    expect(long.status).toBe(400);
    expect(long.body.error.fields[0].path).toBe('body.password');
    const notEmail = await a.post('/api/auth/sign-in').send({ email: 'not-an-address', password: 'x' });
    expect(notEmail.body.error.fields[0]).toEqual({ path: 'body.email', message: 'This is not an e-mail address' });
    const wrongType = await a.post('/api/auth/sign-in').send({ email: ['a@example.test'], password: 5 });
    expect(wrongType.status).toBe(400);
    expect(wrongType.body.error.fields.map((f: { path: string }) => f.path).sort()).toEqual(['body.email', 'body.password']);
  });

  it('refuses state-changing requests without the CSRF header', async () => {
    const user = await makeUser({ workspace: await makeWorkspace() });
    const res = await request(app).post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD });
    expect(res.status).toBe(403);
    expect(res.body.error.fields[0].path).toBe('headers.x-rotaloom-csrf');
    // A form post from another site (urlencoded, no header) is refused the same way.
    const form = await request(app).post('/api/auth/sign-out').type('form').send('x=1');
    expect(form.status).toBe(403);
  });

  it('limits failed sign-ins per account, then answers 429 with Retry-After even for the right password', async () => {
    const limited = makeApp(db, { env: { ...db.env, signInLimits: { perAccount: 3, perAddress: 100 } } }).app;
    const user = await makeUser({ workspace: await makeWorkspace() });
    for (let i = 0; i < 3; i++) expect((await agent(limited).post('/api/auth/sign-in').send({ email: user.email, password: 'wrong password' })).status).toBe(401);
    const blocked = await agent(limited).post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD });
    expect(blocked.status).toBe(429);
    expect(blocked.body.error.code).toBe('rate_limited');
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
    // Another account from the same address is not affected by this account's limit.
    const other = await makeUser({ workspace: await makeWorkspace() });
    expect((await agent(limited).post('/api/auth/sign-in').send({ email: other.email, password: PASSWORD })).status).toBe(200);
  });

  it('limits failed sign-ins per address across accounts', async () => {
    const limited = makeApp(db, { env: { ...db.env, signInLimits: { perAccount: 100, perAddress: 2 } } }).app;
    await SignInAttempt.destroy({ where: {} });
    await db.sequelize.query('DELETE FROM sign_in_counters');
    const user = await makeUser({ workspace: await makeWorkspace() });
    await agent(limited).post('/api/auth/sign-in').send({ email: 'guess1@example.test', password: 'wrong password' });
    await agent(limited).post('/api/auth/sign-in').send({ email: 'guess2@example.test', password: 'wrong password' });
    const blocked = await agent(limited).post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD });
    expect(blocked.status).toBe(429);
    await SignInAttempt.destroy({ where: {} });
    await db.sequelize.query('DELETE FROM sign_in_counters');
  });

  it('a user with no workspace gets a session with workspace null and 403 on member routes', async () => {
    const user = await makeUser();
    const a = agent(app);
    const res = await a.post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body.workspace).toBeNull();
    expect(res.body.role).toBeNull();
    expect((await a.get('/api/members')).status).toBe(403);
  });
});
