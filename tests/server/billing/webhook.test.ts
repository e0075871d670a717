import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import Stripe from 'stripe';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace } from '../auth/helpers';
import { FAKE_STRIPE_KEYS } from '../../../fakes/stripe/stripe-fake';
import { BillingAccount, BillingEvent } from '../../../server/billing/models';

// The reference for "signed the way the SDK verifies": the stripe package's own test-header helper
// (stripe.webhooks.generateTestHeaderString), documented at https://docs.stripe.com/webhooks#verify-manually
// as t=<timestamp>,v1=<HMAC-SHA256 of "<timestamp>.<payload>"> with the endpoint secret.
const sdk = new Stripe('sk_test_unused_by_these_tests');
const secret = FAKE_STRIPE_KEYS.webhookSecret;

let counter = 0;
function subscriptionEvent(workspaceId: number, over: { id?: string; type?: string; status?: string; quantity?: number; created?: number; subId?: string } = {}) {
  const created = over.created ?? Math.floor(Date.now() / 1000);
  return {
    id: over.id ?? `evt_test_${++counter}_${Date.now()}`,
    object: 'event',
    api_version: '2026-10-28.endive',
    created,
    livemode: false,
    pending_webhooks: 1,
    request: { id: null, idempotency_key: null },
    type: over.type ?? 'customer.subscription.updated',
    data: {
      object: {
        id: over.subId ?? `sub_ws${workspaceId}`,
        object: 'subscription',
        customer: `cus_ws${workspaceId}`,
        status: over.status ?? 'active',
        cancel_at_period_end: false,
        trial_end: null,
        metadata: { workspace_id: String(workspaceId) },
        items: { object: 'list', data: [{ id: `si_ws${workspaceId}`, object: 'subscription_item', quantity: over.quantity ?? 5, current_period_start: created, current_period_end: created + 30 * 86400 }] },
      },
    },
  };
}

describe('payment webhook', () => {
  let db: TestDb;
  let app: ReturnType<typeof makeApp>['app'];
  beforeAll(async () => {
    db = await createTestDb({ ROTALOOM_STRIPE_SECRET_KEY: FAKE_STRIPE_KEYS.secretKey, ROTALOOM_STRIPE_WEBHOOK_SECRET: secret, ROTALOOM_STRIPE_HOST: '127.0.0.1', ROTALOOM_STRIPE_PORT: '9', ROTALOOM_STRIPE_PROTOCOL: 'http' });
    app = makeApp(db).app;
  });
  afterAll(async () => {
    await db.drop();
  });

  // No CSRF header and no session: the webhook is called by the payment service, not a browser.
  const post = (payload: string, signature?: string) => {
    const req = request(app).post('/api/billing/webhook').set('content-type', 'application/json');
    if (signature !== undefined) req.set('stripe-signature', signature);
    return req.send(payload);
  };
  const signed = (payload: string, over: { secret?: string; timestamp?: number } = {}) => sdk.webhooks.generateTestHeaderString({ payload, secret: over.secret ?? secret, timestamp: over.timestamp });

  it('accepts an event signed with the SDK helper and applies it to the workspace', async () => {
    const ws = await makeWorkspace('Signed House', { plan: 'free' });
    const payload = JSON.stringify(subscriptionEvent(ws.id, { type: 'customer.subscription.created', status: 'trialing', quantity: 7 }));
    const res = await post(payload, signed(payload));
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ received: true, duplicate: false });
    const account = await BillingAccount.findByPk(ws.id);
    expect(account?.status).toBe('trialing');
    expect(account?.quantity).toBe(7);
    expect(account?.subscriptionId).toBe(`sub_ws${ws.id}`);
  });

  it('refuses a missing, forged, tampered or stale signature with 400 and changes nothing', async () => {
    const ws = await makeWorkspace('Forged House', { plan: 'free' });
    const events = await BillingEvent.count();
    const payload = JSON.stringify(subscriptionEvent(ws.id, { status: 'active' }));
    const tampered = payload.replace('"quantity":5', '"quantity":500');
    const cases: Array<[string, string | undefined, string]> = [
      ['missing header', undefined, payload],
      ['wrong secret', signed(payload, { secret: 'whsec_not_ours' }), payload],
      ['body changed after signing', signed(payload), tampered],
      ['signed an hour ago (replay window is 5 minutes)', signed(payload, { timestamp: Math.floor(Date.now() / 1000) - 3600 }), payload],
      ['garbage header', 't=1,v1=deadbeef', payload],
    ];
    for (const [label, signature, body] of cases) {
      const res = await post(body, signature);
      expect(res.status, label).toBe(400);
      expect(res.body.error.code, label).toBe('bad_signature');
      expect(res.body.error.fields[0].path, label).toBe('headers.stripe-signature');
    }
    expect(await BillingEvent.count()).toBe(events);
    expect(await BillingAccount.findByPk(ws.id)).toBeNull();
  });

  it('treats a replayed event as a no-op, even after a newer event changed the state', async () => {
    const ws = await makeWorkspace('Replay House', { plan: 'free' });
    const t = Math.floor(Date.now() / 1000);
    const a = JSON.stringify(subscriptionEvent(ws.id, { id: `evt_replay_a_${ws.id}`, status: 'active', quantity: 5, created: t - 10 }));
    const b = JSON.stringify(subscriptionEvent(ws.id, { id: `evt_replay_b_${ws.id}`, status: 'past_due', quantity: 5, created: t }));
    expect((await post(a, signed(a))).status).toBe(200);
    expect((await post(b, signed(b))).status).toBe(200);
    const before = (await BillingAccount.findByPk(ws.id))!.toJSON();
    const eventsBefore = await BillingEvent.count({ where: { workspaceId: ws.id } });
    // The same event again, with a fresh valid signature, as the service's retry would send it.
    const replay = await post(a, signed(a));
    expect(replay.status).toBe(200);
    expect(replay.body.duplicate).toBe(true);
    const after = (await BillingAccount.findByPk(ws.id))!.toJSON();
    expect(after.status).toBe('past_due');
    expect(after).toEqual(before);
    expect(await BillingEvent.count({ where: { workspaceId: ws.id } })).toBe(eventsBefore);
  });

  it('applies concurrent deliveries of one event once', async () => {
    const ws = await makeWorkspace('Twice House', { plan: 'free' });
    const e = JSON.stringify(subscriptionEvent(ws.id, { id: `evt_twice_${ws.id}`, status: 'active', quantity: 3 }));
    const results = await Promise.all([post(e, signed(e)), post(e, signed(e)), post(e, signed(e))]);
    expect(results.map((r) => r.status)).toEqual([200, 200, 200]);
    expect(results.filter((r) => r.body.duplicate === false)).toHaveLength(1);
    expect(await BillingEvent.count({ where: { id: `evt_twice_${ws.id}` } })).toBe(1);
  });

  it('ignores an older subscription event that arrives after a newer one', async () => {
    const ws = await makeWorkspace('Late House', { plan: 'free' });
    const t = Math.floor(Date.now() / 1000);
    const newer = JSON.stringify(subscriptionEvent(ws.id, { status: 'canceled', type: 'customer.subscription.deleted', created: t }));
    const older = JSON.stringify(subscriptionEvent(ws.id, { status: 'active', created: t - 60 }));
    await post(newer, signed(newer));
    const res = await post(older, signed(older));
    expect(res.body.outcome).toMatch(/older/);
    expect((await BillingAccount.findByPk(ws.id))?.status).toBe('canceled');
  });

  it('within one second, orders subscription events by the subscription\'s life, not by arrival (issue 13 item 8)', async () => {
    const ws = await makeWorkspace('Same Second House', { plan: 'free' });
    const t = Math.floor(Date.now() / 1000);
    // Stripe event times have whole seconds (https://docs.stripe.com/api/events/object: `created`, seconds since the epoch)
    const active = JSON.stringify(subscriptionEvent(ws.id, { status: 'active', created: t }));
    const incomplete = JSON.stringify(subscriptionEvent(ws.id, { status: 'incomplete', type: 'customer.subscription.created', created: t }));
    await post(active, signed(active));
    const res = await post(incomplete, signed(incomplete));
    expect(res.body.outcome).toMatch(/same second/);
    expect((await BillingAccount.findByPk(ws.id))?.status).toBe('active');
    // A failed renewal and the card fixed in the portal within the same second: past due → active stands.
    const pastDue = JSON.stringify(subscriptionEvent(ws.id, { status: 'past_due', created: t }));
    await post(pastDue, signed(pastDue));
    expect((await BillingAccount.findByPk(ws.id))?.status).toBe('past_due');
    const recovered = JSON.stringify(subscriptionEvent(ws.id, { status: 'active', created: t }));
    await post(recovered, signed(recovered));
    expect((await BillingAccount.findByPk(ws.id))?.status).toBe('active');
    const deleted = JSON.stringify(subscriptionEvent(ws.id, { status: 'canceled', type: 'customer.subscription.deleted', created: t }));
    await post(deleted, signed(deleted));
    expect((await BillingAccount.findByPk(ws.id))?.status).toBe('canceled');
    // Nothing follows cancelled within its second.
    const revived = JSON.stringify(subscriptionEvent(ws.id, { status: 'active', created: t }));
    expect((await post(revived, signed(revived))).body.outcome).toMatch(/same second/);
    expect((await BillingAccount.findByPk(ws.id))?.status).toBe('canceled');
  });

  it('a late failed invoice does not mark a workspace whose newer subscription state is paid up (issue 13 item 8)', async () => {
    const ws = await makeWorkspace('Late Invoice House', { plan: 'free' });
    const t = Math.floor(Date.now() / 1000);
    const invoiceEvent = (type: string, created: number, id: string) =>
      JSON.stringify({
        id,
        object: 'event',
        created,
        type,
        data: { object: { id: 'in_7', object: 'invoice', number: 'RTL-0077', customer: `cus_ws${ws.id}`, amount_due: 2000, currency: 'gbp', parent: { type: 'subscription_details', subscription_details: { subscription: `sub_ws${ws.id}`, metadata: {} } } } },
      });
    const active = JSON.stringify(subscriptionEvent(ws.id, { status: 'active', created: t }));
    await post(active, signed(active));
    const lateFailure = invoiceEvent('invoice.payment_failed', t - 120, `evt_latefail_${ws.id}`);
    expect((await post(lateFailure, signed(lateFailure))).body.outcome).toMatch(/older than the subscription state/);
    expect((await BillingAccount.findByPk(ws.id))?.lastPaymentError).toBeNull();
    // and the other way round: past due now, a late payment of an earlier invoice leaves the failure shown
    const pastDue = JSON.stringify(subscriptionEvent(ws.id, { status: 'past_due', created: t + 1 }));
    await post(pastDue, signed(pastDue));
    const failure = invoiceEvent('invoice.payment_failed', t + 1, `evt_fail_${ws.id}`);
    await post(failure, signed(failure));
    const latePaid = invoiceEvent('invoice.paid', t - 60, `evt_latepaid_${ws.id}`);
    expect((await post(latePaid, signed(latePaid))).body.outcome).toMatch(/older than the subscription state/);
    expect((await BillingAccount.findByPk(ws.id))?.lastPaymentError).toMatch(/RTL-0077/);
  });

  it('marks the workspace past due on a failed payment and names the amount', async () => {
    const ws = await makeWorkspace('Overdue House', { plan: 'free' });
    const sub = JSON.stringify(subscriptionEvent(ws.id, { status: 'active' }));
    await post(sub, signed(sub));
    const failed = JSON.stringify({
      id: `evt_failed_${ws.id}`,
      object: 'event',
      created: Math.floor(Date.now() / 1000),
      type: 'invoice.payment_failed',
      data: { object: { id: 'in_1', object: 'invoice', number: 'RTL-0042', customer: `cus_ws${ws.id}`, amount_due: 2000, currency: 'gbp', parent: { type: 'subscription_details', subscription_details: { subscription: `sub_ws${ws.id}`, metadata: {} } } } },
    });
    expect((await post(failed, signed(failed))).status).toBe(200);
    expect((await BillingAccount.findByPk(ws.id))?.lastPaymentError).toMatch(/£20\.00.*RTL-0042/);
  });
});
