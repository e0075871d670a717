import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { FlakyProxy } from '../helpers/flaky-proxy';
import { PASSWORD, agent, makeApp, makeUser, makeWorkspace } from '../auth/helpers';
import { routeTable } from '../../../server/http/routes';

/**
 * Issue 13 item 7: while MariaDB is down every route answers 503 with Retry-After (RFC 9110
 * §15.6.4 and §10.2.3: a temporary condition, and when to try again), never 500; while it hangs,
 * requests end within the configured time instead of waiting for ever.
 */
describe('MariaDB down or stalled', () => {
  let db: TestDb;
  let app: ReturnType<typeof makeApp>['app'];
  let proxy: FlakyProxy;
  let cookie: string;
  const TIMEOUT_MS = 2000;

  beforeAll(async () => {
    proxy = new FlakyProxy({ host: process.env.ROTALOOM_DB_HOST ?? '127.0.0.1', port: Number(process.env.ROTALOOM_DB_PORT) });
    await proxy.up();
    db = await createTestDb({ ROTALOOM_DB_PORT: String(proxy.port), ROTALOOM_DB_TIMEOUT_MS: String(TIMEOUT_MS) });
    app = makeApp(db).app;
    const user = await makeUser({ workspace: await makeWorkspace('Down House'), role: 'admin' });
    const res = await agent(app).post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD });
    expect(res.status).toBe(200);
    cookie = String(res.headers['set-cookie'][0]).split(';')[0];
  });
  afterAll(async () => {
    await proxy.up();
    await db.drop();
    await proxy.down();
  });

  const call = (route: (typeof routeTable)[number], withCookie: boolean) => {
    const url = route.path.replace(/:[A-Za-z]+/g, '4000000001');
    let req = request(app)[route.method](url).set('X-Rotaloom-CSRF', '1');
    if (withCookie) req = req.set('Cookie', cookie);
    return route.method === 'get' || route.method === 'delete' ? req : req.send({});
  };

  it('answers 503 with Retry-After on every route, signed in, and never 5xx otherwise signed out', async () => {
    expect((await request(app).get('/api/people').set('Cookie', cookie)).status).toBe(200);
    await proxy.down();
    const wrong: string[] = [];
    let unavailable = 0;
    for (const route of routeTable) {
      const signedIn = await call(route, true);
      const said503 = signedIn.status === 503 && Number(signedIn.headers['retry-after']) > 0 && signedIn.body?.error?.code === 'unavailable';
      if (said503) unavailable++;
      // A route that needs no database (the sign-in providers, with the session read a moment ago) may still answer.
      else if (signedIn.status >= 400) wrong.push(`${route.method} ${route.path} signed in: ${signedIn.status} ${JSON.stringify(signedIn.body)}`);
      const signedOut = await call(route, false);
      const fine = signedOut.status < 500 || (signedOut.status === 503 && Number(signedOut.headers['retry-after']) > 0);
      if (!fine) wrong.push(`${route.method} ${route.path} signed out: ${signedOut.status} ${JSON.stringify(signedOut.body)}`);
    }
    expect(wrong).toEqual([]);
    expect(unavailable).toBeGreaterThan(routeTable.length - 3);
    await proxy.up();
    // and back as soon as it is
    let status = 0;
    for (let i = 0; i < 20 && status !== 200; i++) status = (await request(app).get('/api/people').set('Cookie', cookie)).status;
    expect(status).toBe(200);
  }, 240_000);

  it('a stalled MariaDB ends the request with 503 within the timeout, for a pooled connection and a new one', async () => {
    await proxy.up();
    // back up after the outage above: the pool may hand out a connection that died with it first (a 503, as it should)
    let status = 0;
    for (let i = 0; i < 20 && status !== 200; i++) {
      status = (await request(app).get('/api/people').set('Cookie', cookie)).status;
      if (status !== 200) await new Promise((r) => setTimeout(r, 250));
    }
    expect(status).toBe(200);
    proxy.stall();
    for (let i = 0; i < 2; i++) {
      const started = Date.now();
      const res = await request(app).get('/api/people').set('Cookie', cookie);
      const took = Date.now() - started;
      expect(res.status).toBe(503);
      expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
      // the socket timeout, or the 5 s connect timeout for a new connection, plus slack for a busy machine
      expect(took).toBeLessThan(5000 + TIMEOUT_MS + 4000);
    }
    await proxy.up();
  }, 60_000);
});
