import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { startStripeFake, type StripeFake } from '../../../fakes/stripe/stripe-fake';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp } from '../auth/helpers';
import { seatSync } from '../../../server/billing/seat-sync';

export interface BillingWorld {
  db: TestDb;
  fake: StripeFake;
  app: ReturnType<typeof makeApp>['app'];
  server: Server;
  url: string;
  stop(): Promise<void>;
}

/**
 * A test database, the payments fake, and the app listening on a loopback port, so the fake can
 * deliver its signed webhook events to it the way it does under `npm start`.
 */
export async function startBillingWorld(overrides: Partial<NodeJS.ProcessEnv> = {}): Promise<BillingWorld> {
  const fake = await startStripeFake();
  const db = await createTestDb({ ...fake.env, ROTALOOM_SEAT_SYNC_DELAY_MS: '50', ...overrides });
  const { app } = makeApp(db);
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  fake.webhookUrl = `${url}/api/billing/webhook`;
  return {
    db,
    fake,
    app,
    server,
    url,
    async stop() {
      seatSync()?.stop();
      await fake.settled();
      await fake.stop();
      server.closeAllConnections();
      await new Promise((r) => server.close(r));
      await db.drop();
    },
  };
}

/** Pays on the fake's checkout page the way the browser form posts it. */
export async function payOnCheckoutPage(checkoutUrl: string, card: string, extra: Record<string, string> = {}) {
  const res = await fetch(checkoutUrl, {
    method: 'POST',
    redirect: 'manual',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ email: 'owner@example.test', card, expiry: '12/34', cvc: '123', holder: 'Test Holder', ...extra }).toString(),
  });
  return { status: res.status, location: res.headers.get('location'), text: await res.text() };
}

/** Waits until `check` passes (events arrive asynchronously), or fails with its last error. */
export async function eventually<T>(check: () => Promise<T>, timeoutMs = 8000): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    try {
      return await check();
    } catch (err) {
      if (Date.now() > until) throw err;
      await new Promise((r) => setTimeout(r, 50));
    }
  }
}
