import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { agent, makeApp } from '../auth/helpers';

/**
 * Two API processes (two apps on the same database and Redis) count one client's sign-up and
 * password-reset requests together (rate-limit-redis), so the limit holds behind a load balancer.
 * The RateLimit header is read as the IETF draft defines it (draft-ietf-httpapi-ratelimit-headers-08,
 * express-rate-limit's `standardHeaders: 'draft-8'`): `"<policy>";r=<remaining>;t=<seconds to reset>`.
 */
describe('rate limits shared across API processes through Redis', () => {
  let db: TestDb;
  let first: Express;
  let second: Express;

  beforeAll(async () => {
    db = await createTestDb({ ROTALOOM_ACCOUNT_REQUESTS_PER_ADDRESS: '4' });
    first = makeApp(db).app;
    second = makeApp(db).app;
  });
  afterAll(async () => {
    await db.drop();
  });

  const remaining = (header: string | undefined) => Number(/;\s*r=(\d+)/.exec(header ?? '')?.[1]);
  const forgot = (app: Express) => agent(app).post('/api/auth/forgot-password').send({ email: 'nobody.here@example.test' });

  it('counts requests to either process against one limit, and the fifth is refused in words', async () => {
    const answers = [];
    for (const app of [first, second, first, second]) answers.push(await forgot(app));
    expect(answers.map((a) => a.status)).toEqual([202, 202, 202, 202]);
    // Alternating processes, the remaining count still falls by one each time: 3, 2, 1, 0.
    expect(answers.map((a) => remaining(a.headers.ratelimit))).toEqual([3, 2, 1, 0]);
    const refused = await agent(first).post('/api/auth/sign-up').send({ email: 'new.one@example.test', password: 'a long enough password', displayName: 'New One' });
    expect(refused.status).toBe(429);
    expect(refused.body.error.code).toBe('rate_limited');
    expect(refused.body.error.message).toMatch(/Too many requests/);
    expect((await forgot(second)).status).toBe(429);
  });
});
