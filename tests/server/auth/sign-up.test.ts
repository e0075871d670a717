import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import bcrypt from 'bcryptjs';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { PASSWORD, agent, linkIn, makeApp, makeUser, makeWorkspace, signUpThroughMail, signedIn, uniqueEmail, waitForMail } from './helpers';
import { SignUpRequest } from '../../../server/auth/models';
import { SIGN_UP_MAILS_PER_HOUR } from '../../../server/auth/sign-up';
import { BCRYPT_COST } from '../../../server/auth/passwords';
import { Membership, User, Workspace } from '../../../server/db/models';

const CHOSEN = 'tern lichen barometer';
const fields = (email: string, extra: Record<string, string> = {}) => ({ displayName: 'Odile Brackenbury', email, password: CHOSEN, workspaceName: 'Larkspur Lab', timeZone: 'Europe/Berlin', ...extra });
const pause = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** The answer with the address itself taken out: everything else must not depend on it. */
function shape(res: { status: number; body: { email?: string; message?: string }; headers: Record<string, string | string[] | undefined> }, email: string) {
  const names = Object.keys(res.headers).filter((h) => !['date', 'content-length', 'ratelimit', 'etag'].includes(h)).sort();
  const cookie = [res.headers['set-cookie'] ?? []].flat().map((c) => c.replace(/=[^;]*/, '=…'));
  return { status: res.status, body: JSON.parse(JSON.stringify(res.body).split(email).join('<address>')), names, cookie };
}

describe('sign-up waits for the e-mailed link and reveals no accounts (issue 13 item 6)', () => {
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

  it('a new address gets a link and nothing more; the link makes the account and workspace and signs in', async () => {
    const a = agent(app);
    const since = mailer.outbox.length;
    const asked = await a.post('/api/auth/sign-up').send(fields('Odile@Example.test'));
    expect(asked.status).toBe(202);
    expect(asked.body).toEqual({ email: 'odile@example.test', message: expect.stringMatching(/^Check your e-mail to finish signing up/) });
    expect(await User.count({ where: { email: 'odile@example.test' } })).toBe(0);
    expect((await a.get('/api/auth/session')).body.user).toBeNull();

    const mail = await waitForMail(mailer, 'odile@example.test', '/finish-sign-up', since);
    expect(mail.subject).toBe('Finish signing up to Rotaloom');
    expect(mail.text).toContain('Larkspur Lab');
    expect(mail.html).toContain('Larkspur Lab');
    const token = linkIn(mail, '/finish-sign-up').searchParams.get('token')!;
    // At rest only the SHA-256 of the link (FIPS 180-4, computed here by Node's own crypto) and a bcrypt hash of the password.
    const row = await SignUpRequest.findOne({ where: { email: 'odile@example.test' } });
    expect(row!.tokenHash).toBe(createHash('sha256').update(token).digest('hex'));
    const [stored] = await db.sequelize.query('SELECT * FROM sign_up_requests');
    expect(JSON.stringify(stored)).not.toContain(token);
    expect(JSON.stringify(stored)).not.toContain(CHOSEN);
    expect(await bcrypt.compare(CHOSEN, row!.passwordHash!)).toBe(true);

    const preview = await a.get(`/api/auth/sign-up/preview?token=${token}`);
    expect(preview.status).toBe(200);
    expect(preview.body).toEqual({ email: 'odile@example.test', displayName: 'Odile Brackenbury', workspaceName: 'Larkspur Lab', passwordNeeded: false });
    const finished = await a.post('/api/auth/sign-up/finish').send({ token });
    expect(finished.status).toBe(201);
    expect(finished.body).toMatchObject({ user: { email: 'odile@example.test', displayName: 'Odile Brackenbury', emailVerified: true, hasPassword: true }, workspace: { name: 'Larkspur Lab', timeZone: 'Europe/Berlin' }, role: 'admin' });
    expect((await a.get('/api/auth/session')).body.role).toBe('admin');
    expect((await agent(app).post('/api/auth/sign-in').send({ email: 'odile@example.test', password: CHOSEN })).status).toBe(200);
    expect((await SignUpRequest.findByPk(row!.id))!.passwordHash).toBeNull();
  });

  it('answers a taken address exactly as a new one, makes nothing, and mails the owner a way in', async () => {
    const workspace = await makeWorkspace('Fennel Court');
    const owner = await makeUser({ workspace, role: 'coordinator', displayName: 'Perpetua Vance' });
    const fresh = uniqueEmail('fresh');
    const users = await User.count();
    const workspaces = await Workspace.count();
    const since = mailer.outbox.length;

    const forNew = await agent(app).post('/api/auth/sign-up').send(fields(fresh));
    const forTaken = await agent(app).post('/api/auth/sign-up').send(fields(owner.email));
    expect(forTaken.status).toBe(202);
    expect(shape(forTaken, owner.email)).toEqual(shape(forNew, fresh));
    expect(forTaken.headers['set-cookie']).toBeDefined();

    const notice = await waitForMail(mailer, owner.email, '/forgot-password', since);
    expect(notice.subject).toBe('Someone tried to sign up to Rotaloom with your address');
    expect(notice.text).toContain('Hello Perpetua Vance,');
    expect(notice.text).toContain('Fennel Court');
    expect(linkIn(notice, '/forgot-password').href).toBe(`${db.env.publicUrl}/forgot-password`);
    expect(notice.text).toContain(`${db.env.publicUrl}/\n`);
    expect(notice.text).not.toContain('/finish-sign-up');
    await waitForMail(mailer, fresh, '/finish-sign-up', since);
    expect(mailer.outbox.slice(since).map((m) => m.to).sort()).toEqual([fresh, owner.email].sort());

    // Nothing of what was typed is kept for the taken address, and the owner's account is as it was.
    const row = await SignUpRequest.findOne({ where: { email: owner.email } });
    expect(row).toMatchObject({ existingUserId: owner.id, passwordHash: null, displayName: null, workspaceName: null });
    expect(await User.count()).toBe(users);
    expect(await Workspace.count()).toBe(workspaces);
    expect(await Membership.count({ where: { userId: owner.id } })).toBe(1);
    expect((await agent(app).post('/api/auth/sign-in').send({ email: owner.email, password: CHOSEN })).status).toBe(401);
    expect((await agent(app).post('/api/auth/sign-in').send({ email: owner.email, password: PASSWORD })).status).toBe(200);
  });

  it('takes the bcrypt time on both paths, so the taken address does not answer sooner', async () => {
    const owner = await makeUser();
    // The reference: what bcryptjs itself takes for one hash at the server's cost.
    const median = (xs: number[]) => [...xs].sort((p, q) => p - q)[Math.floor(xs.length / 2)];
    const hashes: number[] = [];
    for (let i = 0; i < 5; i++) {
      const t = performance.now();
      await bcrypt.hash(CHOSEN, BCRYPT_COST);
      hashes.push(performance.now() - t);
    }
    const timed = async (email: string) => {
      const t = performance.now();
      const res = await agent(app).post('/api/auth/sign-up').send(fields(email));
      expect(res.status).toBe(202);
      return performance.now() - t;
    };
    await timed(uniqueEmail('warm'));
    const taken: number[] = [];
    const fresh: number[] = [];
    for (let i = 0; i < 5; i++) {
      taken.push(await timed(owner.email));
      fresh.push(await timed(uniqueEmail('timed')));
    }
    // Skipping the hash for a taken address would answer in a small fraction of one hash's time.
    expect(median(taken)).toBeGreaterThan(0.7 * median(hashes));
    expect(median(fresh)).toBeGreaterThan(0.7 * median(hashes));
    expect(median(taken) / median(fresh)).toBeGreaterThan(0.6);
  });

  it('a link works once: a second use, and simultaneous uses, are refused in words', async () => {
    const email = uniqueEmail('once');
    const { token } = await signUpThroughMail(app, mailer, fields(email));
    const again = await agent(app).post('/api/auth/sign-up/finish').send({ token, password: CHOSEN });
    expect(again.status).toBe(410);
    expect(again.body.error).toMatchObject({ code: 'gone', message: expect.stringMatching(/already used/), fields: [{ path: 'body.token' }] });
    const preview = await agent(app).get(`/api/auth/sign-up/preview?token=${token}`);
    expect(preview.status).toBe(410);
    expect(preview.body.error.fields[0].path).toBe('query.token');

    const racer = agent(app);
    const since = mailer.outbox.length;
    const raceEmail = uniqueEmail('race');
    await racer.post('/api/auth/sign-up').send(fields(raceEmail));
    const raceToken = linkIn(await waitForMail(mailer, raceEmail, '/finish-sign-up', since), '/finish-sign-up').searchParams.get('token');
    const answers = await Promise.all(Array.from({ length: 6 }, () => racer.post('/api/auth/sign-up/finish').send({ token: raceToken })));
    expect(answers.filter((r) => r.status === 201)).toHaveLength(1);
    for (const r of answers.filter((x) => x.status !== 201)) {
      expect([409, 410]).toContain(r.status);
      expect(r.body.error.fields[0].path).toBe('body.token');
    }
    expect(await User.count({ where: { email: raceEmail } })).toBe(1);
    const made = await User.findOne({ where: { email: raceEmail } });
    expect(await Membership.count({ where: { userId: made!.id } })).toBe(1);
  });

  it('an expired link is refused with words that say so, and an unknown one as not valid', async () => {
    const email = uniqueEmail('late');
    const since = mailer.outbox.length;
    const a = agent(app);
    await a.post('/api/auth/sign-up').send(fields(email));
    const token = linkIn(await waitForMail(mailer, email, '/finish-sign-up', since), '/finish-sign-up').searchParams.get('token')!;
    await SignUpRequest.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { email } });
    const preview = await a.get(`/api/auth/sign-up/preview?token=${token}`);
    expect(preview.status).toBe(410);
    expect(preview.body.error.message).toMatch(/expired/);
    const finish = await a.post('/api/auth/sign-up/finish').send({ token });
    expect(finish.status).toBe(410);
    expect(finish.body.error.fields).toEqual([{ path: 'body.token', message: expect.stringMatching(/expired/) }]);
    expect(await User.count({ where: { email } })).toBe(0);
    const unknown = await a.post('/api/auth/sign-up/finish').send({ token: 'x'.repeat(43) });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.fields[0].path).toBe('body.token');
  });

  it('opened in another browser, the link asks for the password chosen at sign-up', async () => {
    const email = uniqueEmail('elsewhere');
    const since = mailer.outbox.length;
    await agent(app).post('/api/auth/sign-up').send(fields(email));
    const token = linkIn(await waitForMail(mailer, email, '/finish-sign-up', since), '/finish-sign-up').searchParams.get('token')!;
    const other = agent(app);
    expect((await other.get(`/api/auth/sign-up/preview?token=${token}`)).body.passwordNeeded).toBe(true);
    const none = await other.post('/api/auth/sign-up/finish').send({ token });
    expect(none.status).toBe(400);
    expect(none.body.error.fields).toEqual([{ path: 'body.password', message: 'Enter the password you chose when you signed up' }]);
    const wrong = await other.post('/api/auth/sign-up/finish').send({ token, password: 'not the one chosen' });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields[0].path).toBe('body.password');
    // A wrong password does not use the link up.
    const right = await other.post('/api/auth/sign-up/finish').send({ token, password: CHOSEN });
    expect(right.status).toBe(201);
    expect(right.body.user.email).toBe(email);
  });

  it('an address that got an account meanwhile (an accepted invitation) cannot also be signed up: 409, one user, the membership kept', async () => {
    const workspace = await makeWorkspace('Sorrel Yard');
    const admin = await signedIn(app, workspace, 'admin');
    const email = uniqueEmail('invited');
    const since = mailer.outbox.length;
    const a = agent(app);
    await a.post('/api/auth/sign-up').send(fields(email));
    const signUpToken = linkIn(await waitForMail(mailer, email, '/finish-sign-up', since), '/finish-sign-up').searchParams.get('token');
    expect((await admin.agent.post('/api/invitations').send({ email, role: 'staff' })).status).toBe(201);
    const inviteToken = linkIn(await waitForMail(mailer, email, '/invitation', since), '/invitation').searchParams.get('token');
    const accepted = await agent(app).post('/api/invitations/accept').send({ token: inviteToken, displayName: 'Corin Vale', password: 'staff member passphrase' });
    expect(accepted.status).toBe(201);
    const finish = await a.post('/api/auth/sign-up/finish').send({ token: signUpToken });
    expect(finish.status).toBe(409);
    expect(finish.body.error.fields[0].path).toBe('body.token');
    expect(await User.count({ where: { email } })).toBe(1);
    const user = await User.findOne({ where: { email } });
    expect(await Membership.findAll({ where: { userId: user!.id } })).toMatchObject([{ workspaceId: workspace.id, role: 'staff' }]);
  });

  it(`sends one inbox at most ${SIGN_UP_MAILS_PER_HOUR} sign-up messages an hour, answering every request the same`, async () => {
    const email = uniqueEmail('flooded');
    const since = mailer.outbox.length;
    for (let i = 0; i < SIGN_UP_MAILS_PER_HOUR + 3; i++) expect((await agent(app).post('/api/auth/sign-up').send(fields(email))).status).toBe(202);
    await pause(100);
    expect(mailer.outbox.slice(since).filter((m) => m.to === email)).toHaveLength(SIGN_UP_MAILS_PER_HOUR);
  });

  it('answers bad input with a 400 naming the field, never a 5xx', async () => {
    const bad: Array<[string, 'get' | 'post', unknown, string]> = [
      ['/api/auth/sign-up', 'post', { ...fields('not an address') }, 'body.email'],
      ['/api/auth/sign-up', 'post', { ...fields(uniqueEmail()), password: 'password123' }, 'body.password'],
      ['/api/auth/sign-up', 'post', { ...fields(uniqueEmail()), workspaceName: 'x'.repeat(121) }, 'body.workspaceName'],
      ['/api/auth/sign-up/finish', 'post', {}, 'body.token'],
      ['/api/auth/sign-up/finish', 'post', { token: 12345678901234567890 }, 'body.token'],
      ['/api/auth/sign-up/finish', 'post', { token: 'y'.repeat(43), password: ['a'] }, 'body.password'],
      ['/api/auth/sign-up/finish', 'post', { token: 't'.repeat(500) }, 'body.token'],
      ['/api/auth/sign-up/finish', 'post', { token: `${'z'.repeat(30)}\u0000\r\n` }, 'body.token'],
      ['/api/auth/sign-up/preview?token=short', 'get', undefined, 'query.token'],
      ['/api/auth/sign-up/preview', 'get', undefined, 'query.token'],
      [`/api/auth/sign-up/preview?token=${'%00'.repeat(30)}`, 'get', undefined, 'query.token'],
    ];
    for (const [path, method, body, field] of bad) {
      const res = method === 'get' ? await agent(app).get(path) : await agent(app).post(path).send(body as object);
      expect(res.status, `${method} ${path} ${JSON.stringify(body)}`).toBeGreaterThanOrEqual(400);
      expect(res.status, `${method} ${path}`).toBeLessThan(500);
      expect(res.body.error.fields.map((f: { path: string }) => f.path), `${method} ${path}`).toContain(field);
    }
    const broken = await agent(app).post('/api/auth/sign-up/finish').set('content-type', 'application/json').send('{"token":');
    expect(broken.status).toBe(400);
    expect(broken.body.error.code).toBeDefined();
  });
});
