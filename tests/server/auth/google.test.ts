import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import http from 'node:http';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { PASSWORD, agent, linkIn, makeApp, makeUser, makeWorkspace, waitForMail } from './helpers';
import { startGoogleFake, FAKE_GOOGLE_ACCOUNTS, type GoogleFake } from '../../../fakes/google/oauth-fake';
import { readEnv } from '../../../server/env';
import { Membership, User } from '../../../server/db/models';

type Agent = ReturnType<typeof agent>;

/** Walks the redirect dance: our /google → fake consent page → pick an account → our callback. */
async function googleSignIn(a: Agent, fake: GoogleFake, choice: Record<string, string>, returnTo?: string) {
  const start = await a.get(`/api/auth/google${returnTo ? `?returnTo=${encodeURIComponent(returnTo)}` : ''}`);
  expect(start.status).toBe(302);
  const authorize = new URL(start.headers.location);
  expect(authorize.origin).toBe(fake.url);
  const page = await fetch(authorize);
  expect(page.status).toBe(200);
  expect(await page.text()).toContain('Choose an account');
  const form = new URLSearchParams({ client_id: authorize.searchParams.get('client_id')!, redirect_uri: authorize.searchParams.get('redirect_uri')!, state: authorize.searchParams.get('state')!, ...choice });
  const consent = await fetch(`${fake.url}/o/oauth2/v2/consent`, { method: 'POST', body: form, redirect: 'manual' });
  expect(consent.status).toBe(302);
  const back = new URL(consent.headers.get('location')!);
  return a.get(back.pathname + back.search);
}

describe('Google sign-in through the local OAuth 2 fake', () => {
  let db: TestDb;
  let fake: GoogleFake;
  // One listening server: the redirect URI is built from the request's host and port, which must not change mid-flow.
  let app: http.Server;
  let mailer: ReturnType<typeof makeApp>['mailer'];
  beforeAll(async () => {
    db = await createTestDb();
    fake = await startGoogleFake();
    const env = readEnv({ ...process.env, NODE_ENV: 'test', ROTALOOM_DB_NAME: db.env.db.database, ...fake.env });
    const made = makeApp(db, { env });
    mailer = made.mailer;
    app = http.createServer(made.app);
    await new Promise<void>((resolve) => app.listen(0, '127.0.0.1', resolve));
  });
  afterAll(async () => {
    await new Promise((resolve) => app.close(resolve));
    await fake.stop();
    await db.drop();
  });

  it('says Google is available, and is 404 on a server without Google configured', async () => {
    expect((await agent(app).get('/api/auth/providers')).body).toEqual({ password: true, google: true });
    const plain = makeApp(db).app;
    expect((await agent(plain).get('/api/auth/providers')).body.google).toBe(false);
    expect((await agent(plain).get('/api/auth/google')).status).toBe(404);
  });

  it('a first Google sign-in makes a verified user with their own workspace, as admin', async () => {
    const a = agent(app);
    const done = await googleSignIn(a, fake, { account: FAKE_GOOGLE_ACCOUNTS[0].sub });
    expect(done.status).toBe(302);
    expect(done.headers.location).toBe('/');
    const session = await a.get('/api/auth/session');
    expect(session.status).toBe(200);
    expect(session.body).toMatchObject({ user: { email: 'rowan.ashdown@example.com', displayName: 'Rowan Ashdown', emailVerified: true, hasGoogle: true, hasPassword: false }, role: 'admin', workspace: { name: "Rowan Ashdown's team" } });
    // Signing in again finds the same user.
    const b = agent(app);
    await googleSignIn(b, fake, { account: FAKE_GOOGLE_ACCOUNTS[0].sub });
    expect((await b.get('/api/auth/session')).body.user.id).toBe(session.body.user.id);
    expect(await User.count({ where: { email: 'rowan.ashdown@example.com' } })).toBe(1);
  });

  it('links Google to the password account with the same verified e-mail: one user, both ways in', async () => {
    const workspace = await makeWorkspace('Willowmere House');
    const user = await makeUser({ email: FAKE_GOOGLE_ACCOUNTS[1].email, workspace, role: 'staff', emailVerified: true });
    const a = agent(app);
    await googleSignIn(a, fake, { account: FAKE_GOOGLE_ACCOUNTS[1].sub });
    const session = (await a.get('/api/auth/session')).body;
    expect(session.user).toMatchObject({ id: user.id, hasGoogle: true, hasPassword: true });
    expect(session).toMatchObject({ role: 'staff', workspace: { id: workspace.id } });
    expect(await Membership.count({ where: { userId: user.id } })).toBe(1);
    expect((await agent(app).post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD })).status).toBe(200);
  });

  it('a Google-first account is not signed up twice (its owner is mailed instead) but gets a password through the reset link: still one user', async () => {
    const a = agent(app);
    await googleSignIn(a, fake, { name: 'Ottilie Marsh', email: 'ottilie.marsh@example.test', verified: '1' });
    const id = (await a.get('/api/auth/session')).body.user.id;
    const since = mailer.outbox.length;
    const dup = await agent(app).post('/api/auth/sign-up').send({ displayName: 'Ottilie', email: 'ottilie.marsh@example.test', password: 'a second account please', workspaceName: 'Dup' });
    expect(dup.status).toBe(202);
    const notice = await waitForMail(mailer, 'ottilie.marsh@example.test', '/forgot-password', since);
    expect(notice.text).toContain('Your account signs in with Google');
    expect((await agent(app).post('/api/auth/sign-in').send({ email: 'ottilie.marsh@example.test', password: 'a second account please' })).status).toBe(401);
    await agent(app).post('/api/auth/forgot-password').send({ email: 'ottilie.marsh@example.test' });
    await new Promise((r) => setTimeout(r, 50));
    const token = linkIn(mailer.last('ottilie.marsh@example.test'), '/reset-password').searchParams.get('token');
    const b = agent(app);
    const reset = await b.post('/api/auth/reset-password').send({ token, password: 'now with a password' });
    expect(reset.body.user).toMatchObject({ id, hasGoogle: true, hasPassword: true });
    expect(await User.count({ where: { email: 'ottilie.marsh@example.test' } })).toBe(1);
  });

  it('drops the password of an unverified account that Google proves belongs to someone', async () => {
    const email = 'claimed.address@example.test';
    const squatter = await makeUser({ email, workspace: await makeWorkspace(), emailVerified: false });
    const a = agent(app);
    await googleSignIn(a, fake, { name: 'Real Owner', email, verified: '1' });
    expect((await a.get('/api/auth/session')).body.user).toMatchObject({ id: squatter.id, emailVerified: true, hasPassword: false });
    expect((await agent(app).post('/api/auth/sign-in').send({ email, password: PASSWORD })).status).toBe(401);
  });

  it('a Google sign-in while a password sign-up waits for its link makes one account; the link then says so (409)', async () => {
    const email = 'waiting.signup@example.test';
    const since = mailer.outbox.length;
    const asker = agent(app);
    expect((await asker.post('/api/auth/sign-up').send({ displayName: 'Wanda Reed', email, password: 'tern lichen barometer', workspaceName: 'Reed Rooms' })).status).toBe(202);
    const token = linkIn(await waitForMail(mailer, email, '/finish-sign-up', since), '/finish-sign-up').searchParams.get('token');
    const a = agent(app);
    await googleSignIn(a, fake, { name: 'Wanda Reed', email, verified: '1' });
    expect((await a.get('/api/auth/session')).body.user).toMatchObject({ email, hasGoogle: true, hasPassword: false });
    const finish = await asker.post('/api/auth/sign-up/finish').send({ token });
    expect(finish.status).toBe(409);
    expect(finish.body.error.fields[0].path).toBe('body.token');
    expect(await User.count({ where: { email } })).toBe(1);
  });

  it('refuses an unverified Google address that matches an existing account', async () => {
    const existing = await makeUser({ email: 'mallory.guess@example.test' });
    const a = agent(app);
    const done = await googleSignIn(a, fake, { name: 'Mallory', email: existing.email });
    expect(done.status).toBe(302);
    expect(decodeURIComponent(done.headers.location)).toMatch(/^\/\?signInError=.*not verified/);
    expect((await a.get('/api/auth/session')).body.user).toBeNull();
  });

  it('cancelling on the consent page comes back signed out with a message', async () => {
    const a = agent(app);
    const done = await googleSignIn(a, fake, { deny: '1' });
    expect(decodeURIComponent(done.headers.location)).toContain('cancelled');
    expect((await a.get('/api/auth/session')).body.user).toBeNull();
  });

  it('rejects a callback whose state does not belong to this browser', async () => {
    const a = agent(app);
    const start = await a.get('/api/auth/google');
    const authorize = new URL(start.headers.location);
    const form = new URLSearchParams({ client_id: authorize.searchParams.get('client_id')!, redirect_uri: authorize.searchParams.get('redirect_uri')!, state: authorize.searchParams.get('state')!, account: FAKE_GOOGLE_ACCOUNTS[0].sub });
    const consent = await fetch(`${fake.url}/o/oauth2/v2/consent`, { method: 'POST', body: form, redirect: 'manual' });
    const back = new URL(consent.headers.get('location')!);
    // Another browser (no session with the state nonce) replays the callback.
    const attacker = agent(app);
    const replay = await attacker.get(back.pathname + back.search);
    expect(replay.status).toBe(302);
    expect(replay.headers.location).toMatch(/^\/\?signInError=/);
    expect((await attacker.get('/api/auth/session')).body.user).toBeNull();
  });

  it('coming from an invitation, returns there and makes no workspace; only local paths are kept', async () => {
    const a = agent(app);
    const done = await googleSignIn(a, fake, { name: 'Invited Ivo', email: 'ivo.invited@example.test', verified: '1' }, '/invitation?token=abc');
    expect(done.headers.location).toBe('/invitation?token=abc');
    const session = (await a.get('/api/auth/session')).body;
    expect(session.workspace).toBeNull();
    const b = agent(app);
    const outside = await googleSignIn(b, fake, { account: FAKE_GOOGLE_ACCOUNTS[0].sub }, '//evil.example/steal');
    expect(outside.headers.location).toBe('/');
  });
});
