import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { PASSWORD, agent, linkIn, makeApp, makeUser, makeWorkspace, signUpThroughMail } from './helpers';
import { AccountToken } from '../../../server/auth/models';
import { User } from '../../../server/db/models';

const NEW_PASSWORD = 'a brand new passphrase';

describe('sign-up, password reset, e-mail confirmation and account changes', () => {
  let db: TestDb;
  let app: ReturnType<typeof makeApp>['app'];
  let mailer: ReturnType<typeof makeApp>['mailer'];
  beforeAll(async () => {
    db = await createTestDb();
    ({ app, mailer } = makeApp(db));
  });
  afterAll(async () => {
    await db.drop();
  });

  it('a sign-up finished through the mailed link makes the user, a workspace with them as admin, signs them in, with the address confirmed', async () => {
    const { agent: a, session, mail } = await signUpThroughMail(app, mailer, { displayName: 'Odile Brackenbury', email: 'Odile@Example.test', password: NEW_PASSWORD, workspaceName: 'Larkspur Lab', timeZone: 'Europe/Berlin' });
    expect(session).toMatchObject({ user: { email: 'odile@example.test', displayName: 'Odile Brackenbury', emailVerified: true, hasPassword: true }, workspace: { name: 'Larkspur Lab', timeZone: 'Europe/Berlin' }, role: 'admin' });
    expect((await a.get('/api/auth/session')).body.role).toBe('admin');
    expect(mail.subject).toBe('Finish signing up to Rotaloom');
    expect(mail.text).toContain('Larkspur Lab');
  });

  it('answers a second sign-up with the same e-mail as a new one (202), and refuses weak or over-long input (400 per field)', async () => {
    const existing = await makeUser();
    const dup = await agent(app).post('/api/auth/sign-up').send({ displayName: 'X', email: existing.email, password: NEW_PASSWORD, workspaceName: 'W' });
    expect(dup.status).toBe(202);
    expect(dup.body.message).toMatch(/^Check your e-mail/);
    expect(await User.count({ where: { email: existing.email } })).toBe(1);
    const bad = await agent(app).post('/api/auth/sign-up').send({ displayName: 'n'.repeat(121), email: 'ok@example.test', password: 'short', workspaceName: '' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.map((f: { path: string }) => f.path).sort()).toEqual(['body.displayName', 'body.password', 'body.workspaceName']);
  });

  it('forgot-password answers the same for known and unknown addresses, and mails only the known one', async () => {
    const user = await makeUser({ workspace: await makeWorkspace('Fennel Court') });
    const before = mailer.outbox.length;
    const known = await agent(app).post('/api/auth/forgot-password').send({ email: user.email });
    const unknown = await agent(app).post('/api/auth/forgot-password').send({ email: 'ghost@example.test' });
    expect(known.status).toBe(202);
    expect(unknown.status).toBe(202);
    expect(known.body).toEqual(unknown.body);
    await new Promise((r) => setTimeout(r, 50));
    expect(mailer.outbox.length).toBe(before + 1);
    const mail = mailer.last(user.email)!;
    expect(mail.subject).toBe('Choose a new Rotaloom password');
    expect(mail.text).toContain('Fennel Court');
  });

  it('a reset link sets the password once, signs in, ends other sessions, and cannot be reused', async () => {
    const user = await makeUser({ workspace: await makeWorkspace() });
    const other = agent(app);
    expect((await other.post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD })).status).toBe(200);
    await agent(app).post('/api/auth/forgot-password').send({ email: user.email });
    await new Promise((r) => setTimeout(r, 50));
    const token = linkIn(mailer.last(user.email), '/reset-password').searchParams.get('token')!;

    const a = agent(app);
    const reset = await a.post('/api/auth/reset-password').send({ token, password: NEW_PASSWORD });
    expect(reset.status).toBe(200);
    expect(reset.body.user.id).toBe(user.id);
    expect((await other.get('/api/auth/session')).body.user).toBeNull();
    expect((await agent(app).post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD })).status).toBe(401);
    expect((await agent(app).post('/api/auth/sign-in').send({ email: user.email, password: NEW_PASSWORD })).status).toBe(200);

    const again = await agent(app).post('/api/auth/reset-password').send({ token, password: 'yet another passphrase' });
    expect(again.status).toBe(410);
    expect(again.body.error.fields[0].path).toBe('body.token');
  });

  it('refuses expired and unknown reset links, naming body.token', async () => {
    const user = await makeUser();
    await agent(app).post('/api/auth/forgot-password').send({ email: user.email });
    await new Promise((r) => setTimeout(r, 50));
    const token = linkIn(mailer.last(user.email), '/reset-password').searchParams.get('token')!;
    await AccountToken.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { userId: user.id, purpose: 'password-reset' } });
    const expired = await agent(app).post('/api/auth/reset-password').send({ token, password: NEW_PASSWORD });
    expect(expired.status).toBe(410);
    expect(expired.body.error.message).toMatch(/expired/);
    expect(expired.body.error.fields[0].path).toBe('body.token');
    const unknown = await agent(app).post('/api/auth/reset-password').send({ token: 'x'.repeat(43), password: NEW_PASSWORD });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.fields[0].path).toBe('body.token');
  });

  it('a newer reset link replaces the older one', async () => {
    const user = await makeUser();
    await agent(app).post('/api/auth/forgot-password').send({ email: user.email });
    await new Promise((r) => setTimeout(r, 50));
    const first = linkIn(mailer.last(user.email), '/reset-password').searchParams.get('token')!;
    await agent(app).post('/api/auth/forgot-password').send({ email: user.email });
    await new Promise((r) => setTimeout(r, 50));
    const second = linkIn(mailer.last(user.email), '/reset-password').searchParams.get('token')!;
    expect(second).not.toBe(first);
    expect((await agent(app).post('/api/auth/reset-password').send({ token: first, password: NEW_PASSWORD })).status).toBe(410);
    expect((await agent(app).post('/api/auth/reset-password').send({ token: second, password: NEW_PASSWORD })).status).toBe(200);
  });

  it('changing the password needs the current one and signs out other sessions', async () => {
    const user = await makeUser({ workspace: await makeWorkspace() });
    const a = agent(app);
    const b = agent(app);
    await a.post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD });
    await b.post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD });
    const wrong = await a.post('/api/auth/change-password').send({ currentPassword: 'not it', newPassword: NEW_PASSWORD });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields[0].path).toBe('body.currentPassword');
    const ok = await a.post('/api/auth/change-password').send({ currentPassword: PASSWORD, newPassword: NEW_PASSWORD });
    expect(ok.status).toBe(200);
    expect((await a.get('/api/auth/session')).status).toBe(200);
    expect((await b.get('/api/auth/session')).body.user).toBeNull();
    expect((await agent(app).post('/api/auth/sign-in').send({ email: user.email, password: NEW_PASSWORD })).status).toBe(200);
  });

  it('changing the e-mail takes effect only when the link sent to the new address is opened', async () => {
    const user = await makeUser({ workspace: await makeWorkspace() });
    const taken = await makeUser();
    const a = agent(app);
    await a.post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD });
    expect((await a.post('/api/auth/change-email').send({ email: taken.email, currentPassword: PASSWORD })).status).toBe(409);
    const newEmail = `moved.${user.id}@example.test`;
    const res = await a.post('/api/auth/change-email').send({ email: newEmail, currentPassword: PASSWORD });
    expect(res.status).toBe(202);
    expect((await a.get('/api/auth/session')).body.user.email).toBe(user.email);
    await new Promise((r) => setTimeout(r, 50));
    const token = linkIn(mailer.last(newEmail), '/confirm-email').searchParams.get('token');
    expect((await agent(app).post('/api/auth/confirm-email').send({ token })).status).toBe(200);
    expect((await a.get('/api/auth/session')).body.user).toMatchObject({ email: newEmail, emailVerified: true });
    expect((await agent(app).post('/api/auth/confirm-email').send({ token })).status).toBe(410);
  });

  it('updates the display name', async () => {
    const user = await makeUser({ workspace: await makeWorkspace() });
    const a = agent(app);
    await a.post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD });
    const res = await a.patch('/api/auth/profile').send({ displayName: '  Perpetua Vance ' });
    expect(res.status).toBe(200);
    expect(res.body.user.displayName).toBe('Perpetua Vance');
    expect((await a.patch('/api/auth/profile').send({ displayName: '' })).body.error.fields[0].path).toBe('body.displayName');
  });

  it('stores passwords only as bcrypt hashes of cost 10 or more, and never returns or logs them', async () => {
    const logged: string[] = [];
    const originals = { log: console.log, error: console.error, warn: console.warn, info: console.info };
    for (const k of Object.keys(originals) as Array<keyof typeof originals>) console[k] = (...args: unknown[]) => void logged.push(args.map(String).join(' '));
    const secret = 'unmistakable-secret-passphrase-42';
    try {
      const a = agent(app);
      const res = await a.post('/api/auth/sign-up').send({ displayName: 'Hollis Wren', email: 'hollis@example.test', password: secret, workspaceName: 'Wren Works' });
      const [waiting] = await db.sequelize.query("SELECT * FROM sign_up_requests WHERE email = 'hollis@example.test'");
      await signUpThroughMail(app, mailer, { displayName: 'Hollis Wren', email: 'hollis@example.test', password: secret, workspaceName: 'Wren Works' }, a);
      const session = await a.get('/api/auth/session');
      const wrong = await agent(app).post('/api/auth/sign-in').send({ email: 'hollis@example.test', password: `${secret}-x` });
      for (const r of [res, session, wrong]) expect(JSON.stringify(r.body)).not.toContain(secret);
      for (const r of [res, session]) expect(JSON.stringify(r.body)).not.toMatch(/\$2[aby]\$/);
      const [rows] = await db.sequelize.query('SELECT * FROM users');
      const [sessions] = await db.sequelize.query('SELECT data FROM sessions');
      const dump = JSON.stringify([rows, sessions, waiting]);
      expect(dump).not.toContain(secret);
      const stored = await User.scope('withPassword').findOne({ where: { email: 'hollis@example.test' } });
      const cost = Number(/^\$2[aby]\$(\d\d)\$/.exec(stored!.passwordHash!)?.[1]);
      expect(cost).toBeGreaterThanOrEqual(10);
    } finally {
      Object.assign(console, originals);
    }
    expect(logged.join('\n')).not.toContain(secret);
  });
});
