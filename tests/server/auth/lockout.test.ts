import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { PASSWORD, agent, makeApp, makeUser, makeWorkspace, uniqueEmail } from './helpers';
import { createSessionMiddleware } from '../../../server/auth/session';
import { SessionCache } from '../../../server/auth/session-cache';

type App = ReturnType<typeof makeApp>['app'];

/** Trust proxy is loopback, as behind our own reverse proxy: X-Forwarded-For is the client's address. */
const from = (app: App, address: string) => agent(app).set('X-Forwarded-For', address);

const signIn = (app: App, address: string, email: string, password: string) => from(app, address).post('/api/auth/sign-in').send({ email, password });

let db: TestDb;
let app: App;
beforeAll(async () => {
  db = await createTestDb();
  app = makeApp(db).app;
});
afterAll(async () => {
  await db.drop();
});

describe('sign-in without lockout abuse (issue 13 item 6)', () => {
  it('counts a burst atomically: 20 simultaneous wrong passwords against a limit of 10 pass exactly 10 times', async () => {
    const limited = makeApp(db, { env: { ...db.env, signInLimits: { perAccount: 10, perAddress: 1000 } } }).app;
    const user = await makeUser({ workspace: await makeWorkspace() });
    const answers = await Promise.all(Array.from({ length: 20 }, () => signIn(limited, '203.0.113.7', user.email, 'not the password at all')));
    const statuses = answers.map((r) => r.status).sort();
    // closed form: with the check and the count one step, min(N, limit) tries get an answer
    expect(statuses.filter((s) => s === 401)).toHaveLength(10);
    expect(statuses.filter((s) => s === 429)).toHaveLength(10);
    for (const r of answers.filter((a) => a.status === 429)) expect(Number(r.headers['retry-after'])).toBeGreaterThan(0);
  });

  it('a right password from a fresh address is not refused because other addresses failed', async () => {
    const limited = makeApp(db, { env: { ...db.env, signInLimits: { perAccount: 3, perAddress: 1000 } } }).app;
    const user = await makeUser({ workspace: await makeWorkspace() });
    for (const address of ['198.51.100.1', '198.51.100.2']) {
      for (let i = 0; i < 3; i++) expect((await signIn(limited, address, user.email, 'wrong password here')).status).toBe(401);
      expect((await signIn(limited, address, user.email, PASSWORD)).status).toBe(429);
    }
    expect((await signIn(limited, '198.51.100.3', user.email, PASSWORD)).status).toBe(200);
  });

  it('many failures behind one address do not lock out an account that signed in from there before', async () => {
    const limited = makeApp(db, { env: { ...db.env, signInLimits: { perAccount: 100, perAddress: 3 } } }).app;
    const office = '192.0.2.44';
    const regular = await makeUser({ workspace: await makeWorkspace() });
    const newcomer = await makeUser({ workspace: await makeWorkspace() });
    expect((await signIn(limited, office, regular.email, PASSWORD)).status).toBe(200);
    for (let i = 0; i < 3; i++) expect((await signIn(limited, office, uniqueEmail('guess'), 'wrong password here')).status).toBe(401);
    // the address is at its limit for accounts it has not used ...
    expect((await signIn(limited, office, newcomer.email, PASSWORD)).status).toBe(429);
    // ... but the account signed in from there before still gets in, and so does anyone elsewhere
    expect((await signIn(limited, office, regular.email, PASSWORD)).status).toBe(200);
    expect((await signIn(limited, '192.0.2.45', newcomer.email, PASSWORD)).status).toBe(200);
  });

  it('a right password clears the address\'s count for that account', async () => {
    const limited = makeApp(db, { env: { ...db.env, signInLimits: { perAccount: 3, perAddress: 1000 } } }).app;
    const user = await makeUser({ workspace: await makeWorkspace() });
    const address = '198.51.100.77';
    for (let i = 0; i < 2; i++) await signIn(limited, address, user.email, 'wrong password here');
    expect((await signIn(limited, address, user.email, PASSWORD)).status).toBe(200);
    for (let i = 0; i < 3; i++) expect((await signIn(limited, address, user.email, 'wrong password here')).status).toBe(401);
    expect((await signIn(limited, address, user.email, PASSWORD)).status).toBe(429);
  });
});

describe('choosing a password (issue 13 item 6)', () => {
  const signUp = (password: string, extra: Record<string, string> = {}) =>
    agent(app).post('/api/auth/sign-up').send({ displayName: 'Maren Fairweather', email: uniqueEmail('maren'), password, workspaceName: 'Gullhaven Hospice', ...extra });

  it('refuses a password over 72 bytes (bcrypt ignores the rest), counting bytes, not characters', async () => {
    // 'é' is two bytes in UTF-8 (RFC 3629 §3: U+0080..U+07FF take two); Buffer.byteLength is Node's own count
    const tooLong = 'élan vital é '.repeat(6); // 78 characters, 90 bytes
    const fits = 'river otter lantern quince '.repeat(3).slice(0, 72);
    expect(Buffer.byteLength(tooLong, 'utf8')).toBeGreaterThan(72);
    expect(tooLong.length).toBeLessThan(200);
    expect(Buffer.byteLength(fits, 'utf8')).toBe(72);
    const refused = await signUp(tooLong);
    expect(refused.status).toBe(400);
    expect(refused.body.error.fields[0].path).toBe('body.password');
    expect(refused.body.error.fields[0].message).toMatch(/72 bytes/);
    expect((await signUp(fits)).status).toBe(202);
    // 37 two-byte letters: 37 characters, 74 bytes
    const accents = 'é'.repeat(37);
    expect(Buffer.byteLength(accents, 'utf8')).toBe(74);
    expect((await signUp(accents)).body.error.fields[0].message).toMatch(/72 bytes/);
  });

  it('refuses common passwords (entries of the NCSC "PwnedPasswordsTop100k" list) and ones made of the account\'s own words', async () => {
    // Source: UK National Cyber Security Centre, "PwnedPasswordsTop100k.txt" (2019), entries of 10+ characters.
    for (const common of ['1234567890', 'qwertyuiop', 'password123', '1q2w3e4r5t', '0987654321']) {
      const res = await signUp(common);
      expect(res.status, common).toBe(400);
      expect(res.body.error.fields[0].path).toBe('body.password');
    }
    const own = await signUp('gullhaven hospice', { workspaceName: 'Gullhaven Hospice' });
    expect(own.status).toBe(400);
    expect((await signUp('tern lichen barometer')).status).toBe(202);
  });

  it('applies the same checks to a reset and a change of password', async () => {
    const user = await makeUser({ workspace: await makeWorkspace() });
    const a = agent(app);
    expect((await a.post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD })).status).toBe(200);
    const weak = await a.post('/api/auth/change-password').send({ currentPassword: PASSWORD, newPassword: 'password123' });
    expect(weak.status).toBe(400);
    expect(weak.body.error.fields[0].path).toBe('body.newPassword');
    const long = await a.post('/api/auth/change-password').send({ currentPassword: PASSWORD, newPassword: 'ü'.repeat(40) });
    expect(long.body.error.fields[0].path).toBe('body.newPassword');
  });
});

describe('sessions end when they should (issue 13 item 6)', () => {
  async function signedInCookie() {
    const user = await makeUser({ workspace: await makeWorkspace(), role: 'coordinator' });
    const res = await agent(app).post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD });
    expect(res.status).toBe(200);
    const cookie = String(res.headers['set-cookie'][0]).split(';')[0];
    const sid = decodeURIComponent(cookie.split('=')[1]).replace(/^s:/, '').split('.')[0];
    return { user, cookie, sid };
  }

  it('sign-out leaves no window: reads racing it cannot keep the old cookie working', async () => {
    for (let round = 0; round < 5; round++) {
      const { cookie } = await signedInCookie();
      const read = () => request(app).get('/api/people').set('Cookie', cookie);
      const racing = Array.from({ length: 6 }, read);
      const out = request(app).post('/api/auth/sign-out').set('Cookie', cookie).set('X-Rotaloom-CSRF', '1');
      await Promise.all([...racing, out]);
      // straight after sign-out's answer, never "up to a second" later
      for (let i = 0; i < 5; i++) expect((await read()).status).toBe(401);
    }
  });

  it('a read that began before a clear does not put its row back in the cache', () => {
    const cache = new SessionCache();
    const mark = cache.mark();
    cache.clear(); // sign-out happened while the read was in the database
    cache.remember('sid-1', { data: '{}', account: null, expires: Date.now() + 60_000 }, mark);
    expect(cache.get('sid-1')).toBeUndefined();
    cache.remember('sid-1', { data: '{}', account: null, expires: Date.now() + 60_000 }, cache.mark());
    expect(cache.get('sid-1')).toBeDefined();
  });

  it('a request that changed its session after sign-out does not bring the session row back', async () => {
    const { sid } = await signedInCookie();
    const { store } = createSessionMiddleware(db.env, db.sequelize);
    const data = await new Promise<Record<string, unknown>>((resolve, reject) => store.get(sid, (err, s) => (err ? reject(err) : resolve(s as never))));
    const session = store.createSession({ sessionID: sid, sessionStore: store } as never, data as never);
    await new Promise<void>((resolve, reject) => store.destroy(sid, (err) => (err ? reject(err) : resolve())));
    (session as unknown as { workspaceId: number }).workspaceId = 12345;
    await new Promise<void>((resolve, reject) => store.set(sid, session, (err) => (err ? reject(err) : resolve())));
    const [rows] = await db.sequelize.query('SELECT sid FROM sessions WHERE sid = ?', { replacements: [sid] });
    expect(rows).toHaveLength(0);
  });

  it('a session ends 30 days after sign-in however active it is', async () => {
    const { cookie, sid } = await signedInCookie();
    expect((await request(app).get('/api/people').set('Cookie', cookie)).status).toBe(200);
    await db.sequelize.query('UPDATE sessions SET created_at = ? WHERE sid = ?', { replacements: [new Date(Date.now() - 30 * 24 * 3600 * 1000 - 60_000), sid] });
    await new Promise((r) => setTimeout(r, 1100)); // the session cache's second (server/auth/session-cache.ts)
    expect((await request(app).get('/api/people').set('Cookie', cookie)).status).toBe(401);
  });

  it('sends Cache-Control: no-store on signed-in answers', async () => {
    const { cookie } = await signedInCookie();
    for (const path of ['/api/people', '/api/auth/session', '/api/rosters']) {
      const res = await request(app).get(path).set('Cookie', cookie);
      expect(res.status, path).toBe(200);
      expect(res.headers['cache-control'], path).toBe('no-store');
    }
  });
});
