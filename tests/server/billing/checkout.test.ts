import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeWorkspace, signedIn } from '../auth/helpers';
import { makeApiRoster } from '../rosters/fixtures';
import { BillingAccount } from '../../../server/billing/models';
import { TEST_CARDS } from '../../../fakes/stripe/stripe-fake';
import { eventually, payOnCheckoutPage, startBillingWorld, type BillingWorld } from './helpers';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];
const person = (i: number) => ({ name: `Seat Person ${i}`, contractedHours: 20, skillIds: [] });
const DAY = 86_400_000;

/** The fake's own view (what the payment service holds), read over HTTP like any client would. */
async function fakeState(world: BillingWorld) {
  return (await (await fetch(`${world.fake.url}/_fake/state`)).json()) as {
    customers: Array<{ id: string; metadata: Record<string, string> }>;
    subscriptions: Array<{ id: string; customer: string; status: string; cancel_at_period_end: boolean; items: { data: Array<{ quantity: number }> } }>;
    sessions: Array<{ id: string; client_reference_id: string }>;
  };
}

describe('upgrading through the payments fake', () => {
  let world: BillingWorld;
  let admin: Agent;
  let coordinator: Agent;
  let workspaceId: number;
  let workspace: Awaited<ReturnType<typeof makeWorkspace>>;
  let rosterId: number;
  beforeAll(async () => {
    // Long enough that two people added one after the other fall in one settling window.
    world = await startBillingWorld({ ROTALOOM_SEAT_SYNC_DELAY_MS: '400' });
    const ws = await makeWorkspace('Thornbury Surgery', { plan: 'free' });
    workspaceId = ws.id;
    workspace = ws;
    admin = (await signedIn(world.app, ws, 'admin')).agent;
    coordinator = (await signedIn(world.app, ws, 'coordinator')).agent;
    rosterId = (await makeApiRoster(coordinator, ws, { people: 3 })).roster.id;
  });
  afterAll(async () => {
    await world?.stop();
  });

  it('starts a checkout for the team plan with one seat per person and a 14-day trial', async () => {
    const res = await admin.post('/api/billing/checkout');
    expect(res.status).toBe(201);
    expect(res.body.url.startsWith(`${world.fake.url}/pay/cs_test_`)).toBe(true);
    const page = await (await fetch(res.body.url)).text();
    expect(page).toContain('3 seats × £4.00');
    expect(page).toContain('Free for the first 14 days');
  });

  it('a declined card shows a message on the checkout page and makes no subscription', async () => {
    const { url } = (await admin.post('/api/billing/checkout')).body;
    const declined = await payOnCheckoutPage(url, TEST_CARDS.decline);
    expect(declined.status).toBe(402);
    expect(declined.text).toContain('Your card was declined');
    expect((await fakeState(world)).subscriptions).toHaveLength(0);
    expect((await admin.get('/api/billing')).body.plan.id).toBe('free');
  });

  it('two admins upgrading at once get the same checkout, so one subscription', async () => {
    const { agent: secondAdmin } = await signedIn(world.app, workspace, 'admin');
    const [a, b] = await Promise.all([admin.post('/api/billing/checkout'), secondAdmin.post('/api/billing/checkout')]);
    expect([a.status, b.status]).toEqual([201, 201]);
    expect(a.body.url).toBe(b.body.url);
    const sessions = (await fakeState(world)).sessions.filter((s) => s.client_reference_id === String(workspaceId));
    expect(sessions).toHaveLength(1);
    expect((await fakeState(world)).customers.filter((c) => c.metadata.workspace_id === String(workspaceId))).toHaveLength(1);
  });

  it('paying with the test card moves the workspace to the team plan through signed webhook events', async () => {
    const { url } = (await admin.post('/api/billing/checkout')).body;
    const paid = await payOnCheckoutPage(url, `${TEST_CARDS.success.slice(0, 4)} ${TEST_CARDS.success.slice(4, 8)} ${TEST_CARDS.success.slice(8, 12)} ${TEST_CARDS.success.slice(12)}`);
    expect(paid.status).toBe(303);
    expect(paid.location).toBe(`${world.db.env.publicUrl}/billing?checkout=done`);
    const overview = await eventually(async () => {
      const body = (await admin.get('/api/billing')).body;
      expect(body.status).toBe('trialing');
      return body;
    });
    expect(overview.plan.id).toBe('team');
    expect(overview.subscription).toMatchObject({ quantity: 3, monthlyPrice: 1200, cancelAtPeriodEnd: false, managedByPaymentService: true });
    expect(Math.abs(new Date(overview.subscription.trialEnd).getTime() - (Date.now() + 14 * DAY))).toBeLessThan(60_000);
    await world.fake.settled();
    // Every event the fake sent verified with constructEvent and was taken (200).
    expect(world.fake.deliveries.map((d) => [d.type, d.status])).toEqual([
      ['customer.subscription.created', 200],
      ['invoice.paid', 200],
      ['checkout.session.completed', 200],
    ]);
    // Upgrading again is refused; the one subscription stays.
    const again = await admin.post('/api/billing/checkout');
    expect(again.status).toBe(409);
    expect((await fakeState(world)).subscriptions).toHaveLength(1);
    const invoices = (await admin.get('/api/billing/invoices')).body.items;
    expect(invoices).toHaveLength(1);
    expect(invoices[0]).toMatchObject({ status: 'paid', amountDue: 0, currency: 'gbp' });
  });

  it('during the trial, seats follow the number of people once the changes settle', async () => {
    for (let i = 10; i < 12; i++) expect((await coordinator.post('/api/people').send(person(i))).status).toBe(201);
    await eventually(async () => expect((await fakeState(world)).subscriptions[0].items.data[0].quantity).toBe(5));
    await eventually(async () => expect((await BillingAccount.findByPk(workspaceId))?.quantity).toBe(5));
    // Two people added in quick succession: one update, not two.
    const updates = world.fake.deliveries.filter((d) => d.type === 'customer.subscription.updated');
    expect(updates).toHaveLength(1);
  });

  it('on a paid subscription, a seat change waits for the admin, who sees the new price first', async () => {
    const sub = (await fakeState(world)).subscriptions[0];
    await fetch(`${world.fake.url}/_fake/subscriptions/${sub.id}/renew`, { method: 'POST', body: new URLSearchParams({ outcome: 'paid' }) });
    await eventually(async () => expect((await admin.get('/api/billing')).body.status).toBe('active'));
    expect((await coordinator.post('/api/people').send(person(20))).status).toBe(201);
    await new Promise((r) => setTimeout(r, 900)); // past the 400 ms settling window
    const overview = (await admin.get('/api/billing')).body;
    expect(overview.seatChange).toEqual({ from: 5, to: 6 });
    expect((await fakeState(world)).subscriptions[0].items.data[0].quantity).toBe(5);

    const preview = await admin.post('/api/billing/seats/preview').send({ quantity: 6 });
    expect(preview.status).toBe(200);
    expect(preview.body).toMatchObject({ quantity: 6, currentQuantity: 5, currentMonthly: 2000, newMonthly: 2400, currency: 'gbp' });
    // Closed form: one more seat for the rest of a period that has just begun ≈ one full seat (400 p).
    expect(preview.body.nextInvoice.adjustment).toBeGreaterThan(395);
    expect(preview.body.nextInvoice.adjustment).toBeLessThanOrEqual(400);
    expect(preview.body.nextInvoice.amount).toBe(2400 + preview.body.nextInvoice.adjustment);
    expect((await fakeState(world)).subscriptions[0].items.data[0].quantity).toBe(5); // a preview changes nothing

    expect((await admin.post('/api/billing/seats').send({ quantity: 0 })).status).toBe(400);
    const applied = await admin.post('/api/billing/seats').send({ quantity: 6 });
    expect(applied.body).toEqual({ quantity: 6, changed: true });
    expect((await fakeState(world)).subscriptions[0].items.data[0].quantity).toBe(6);
    expect((await admin.get('/api/billing')).body.seatChange).toBeNull();
  });

  it('a failed renewal makes the workspace past due: runs wait, data stays; paying in the portal brings it back', async () => {
    const sub = (await fakeState(world)).subscriptions[0];
    await fetch(`${world.fake.url}/_fake/subscriptions/${sub.id}/renew`, { method: 'POST', body: new URLSearchParams({ outcome: 'failed' }) });
    const overview = await eventually(async () => {
      const body = (await admin.get('/api/billing')).body;
      expect(body.status).toBe('past_due');
      return body;
    });
    expect(overview.pastDue.message).toMatch(/payment of £2[0-9]\.\d\d .* failed/);
    expect(overview.plan.id).toBe('team');
    expect((await coordinator.get(`/api/rosters/${rosterId}`)).status).toBe(200);
    expect((await coordinator.post(`/api/rosters/${rosterId}/runs`).send({ timeLimitSeconds: 0.5 })).status).toBe(402);

    const portal = await admin.post('/api/billing/portal');
    expect(portal.status).toBe(201);
    expect(portal.body.url.startsWith(`${world.fake.url}/portal/`)).toBe(true);
    const saved = await fetch(`${portal.body.url}/card`, { method: 'POST', redirect: 'manual', body: new URLSearchParams({ card: TEST_CARDS.success, expiry: '12/34', cvc: '123' }) });
    expect(saved.status).toBe(303);
    await eventually(async () => expect((await admin.get('/api/billing')).body.status).toBe('active'));
    expect((await coordinator.post(`/api/rosters/${rosterId}/runs`).send({ timeLimitSeconds: 0.5 })).status).toBe(202);
    const invoices = (await admin.get('/api/billing/invoices')).body.items;
    expect(invoices.map((i: { status: string }) => i.status)).toEqual(['paid', 'paid', 'paid']);
  });

  it('cancelling stops at the end of the period; then the free plan applies again', async () => {
    const res = await admin.post('/api/billing/cancel').send({ atPeriodEnd: true });
    expect(res.status).toBe(200);
    expect(res.body.cancelAtPeriodEnd).toBe(true);
    expect((await fakeState(world)).subscriptions[0].cancel_at_period_end).toBe(true);
    expect((await admin.get('/api/billing')).body.plan.id).toBe('team');
    const sub = (await fakeState(world)).subscriptions[0];
    await fetch(`${world.fake.url}/_fake/subscriptions/${sub.id}/renew`, { method: 'POST' });
    await eventually(async () => expect((await admin.get('/api/billing')).body.status).toBe('canceled'));
    const overview = (await admin.get('/api/billing')).body;
    expect(overview.plan.id).toBe('free');
    expect(overview.usage.people).toBe(6);
    // Six people fit the free plan, but the roster in progress fills its one place.
    expect((await coordinator.post('/api/people').send(person(30))).status).toBe(201);
    const second = await coordinator.post('/api/rosters').send({ name: 'Next', periodStart: '2027-06-07', periodEnd: '2027-06-13', timeZone: 'Europe/London' });
    expect(second.status).toBe(402);
    expect(second.body.error.limit).toMatchObject({ name: 'activeRosters', plan: 'free' });
    expect((await admin.post('/api/billing/cancel').send({ atPeriodEnd: 'yes' })).status).toBe(400);
  });
});

describe('the payment service unreachable during checkout', () => {
  let world: BillingWorld;
  beforeAll(async () => {
    world = await startBillingWorld();
  });
  afterAll(async () => {
    await world?.stop();
  });

  it('answers with a clear message and leaves nothing half made; a retry then works with one customer', async () => {
    const ws = await makeWorkspace('Offline Depot', { plan: 'free' });
    const { agent: admin } = await signedIn(world.app, ws, 'admin');
    world.fake.offline = true;
    const res = await admin.post('/api/billing/checkout');
    expect(res.status).toBe(503);
    expect(res.body.error.code).toBe('payment_service_unavailable');
    expect(res.body.error.message).toMatch(/could not be reached.*nothing was charged/);
    const account = await BillingAccount.findByPk(ws.id);
    expect(account?.customerId ?? null).toBeNull();
    expect(account?.checkoutSessionId ?? null).toBeNull();
    expect((await admin.get('/api/billing')).body).toMatchObject({ plan: { id: 'free' }, status: 'none', checkoutOpen: false });

    world.fake.offline = false;
    const retry = await admin.post('/api/billing/checkout');
    expect(retry.status).toBe(201);
    const state = (await (await fetch(`${world.fake.url}/_fake/state`)).json()) as { customers: Array<{ metadata: Record<string, string> }>; subscriptions: unknown[] };
    expect(state.customers.filter((c) => c.metadata.workspace_id === String(ws.id))).toHaveLength(1);
    expect(state.subscriptions).toHaveLength(0);
  });
});
