import { randomUUID } from 'node:crypto';
import type Stripe from 'stripe';
import type { Transaction } from 'sequelize';
import { User, Workspace } from '../db/models';
import { HttpError } from '../http/errors';
import { BillingAccount } from './models';
import { standingOf, usageOf } from './limits';
import { callStripe, teamPriceId, type BillingConfig } from './stripe-client';
import { monthlyPrice, PLANS, planForStatus, type SubscriptionStatus } from '../../shared/billing/plans';

export interface BillingDeps {
  stripe: Stripe | null;
  config: BillingConfig | null;
  publicUrl: string;
}

const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null);
const LIVE: SubscriptionStatus[] = ['trialing', 'active', 'past_due'];

function needStripe(deps: BillingDeps): { stripe: Stripe; config: BillingConfig } {
  // 409, not 5xx: nothing is broken, this server simply has no payment keys (ROTALOOM_STRIPE_SECRET_KEY).
  if (!deps.stripe || !deps.config) throw new HttpError(409, 'payment_service_unavailable', 'Payments are not set up on this server, so the plan cannot be changed here.');
  return { stripe: deps.stripe, config: deps.config };
}

/** The row of a workspace, created when missing and locked for the rest of the transaction. */
export async function lockAccount(workspaceId: number, transaction: Transaction): Promise<BillingAccount> {
  // The workspace row always exists, so locking it first serialises every billing change of one workspace
  // (locking a billing row that may not exist yet would deadlock two concurrent first upgrades on gap locks).
  await BillingAccount.sequelize!.query('SELECT id FROM workspaces WHERE id = ? FOR UPDATE', { replacements: [workspaceId], transaction });
  await BillingAccount.sequelize!.query('INSERT IGNORE INTO billing_accounts (workspace_id, created_at, updated_at) VALUES (?, NOW(), NOW())', { replacements: [workspaceId], transaction });
  return (await BillingAccount.findByPk(workspaceId, { transaction, lock: transaction.LOCK.UPDATE }))!;
}

/** What the billing screen shows: plan, state, usage against limits, seats and prices. No call to the payment service. */
export async function billingOverview(workspaceId: number, deps: BillingDeps) {
  const [{ plan, status, account }, usage] = await Promise.all([standingOf(workspaceId), usageOf(workspaceId)]);
  const quantity = account?.quantity ?? 0;
  const seatPrice = PLANS.team.seatPrice!;
  const live = LIVE.includes(status);
  return {
    plan: PLANS[plan],
    status,
    configured: Boolean(deps.stripe),
    usage,
    limits: PLANS[plan].limits,
    plans: [PLANS.free, PLANS.team],
    subscription: live || status === 'canceled'
      ? {
          managedByPaymentService: Boolean(account?.subscriptionId),
          quantity,
          monthlyPrice: monthlyPrice(quantity),
          currency: seatPrice.currency,
          trialEnd: iso(account?.trialEnd),
          currentPeriodEnd: iso(account?.currentPeriodEnd),
          cancelAtPeriodEnd: account?.cancelAtPeriodEnd ?? false,
        }
      : null,
    // Seat sync: seats follow the people in the workspace. In the trial that happens by itself (seat-sync.ts);
    // on a paid plan the change waits here for an admin to see the new price and confirm it.
    seatChange: live && status !== 'trialing' && account?.subscriptionId && Math.max(1, usage.people) !== quantity ? { from: quantity, to: Math.max(1, usage.people) } : null,
    pastDue: status === 'past_due' ? { message: account?.lastPaymentError ?? 'The last payment failed.' } : null,
    checkoutOpen: Boolean(account?.checkoutSessionId && account.checkoutExpiresAt && account.checkoutExpiresAt > new Date()),
    canStartTrial: !account?.trialEnd,
  };
}

/**
 * Starts (or resumes) the checkout for the team plan and returns its URL. The workspace's row is
 * locked for the whole of it, and an open checkout is handed out again instead of a new one, so two
 * admins upgrading at once end with one checkout and one subscription. If the payment service is
 * unreachable the transaction rolls back and nothing is half made.
 */
export async function startCheckout(workspaceId: number, userId: number, deps: BillingDeps): Promise<{ url: string; reused: boolean }> {
  const { stripe, config } = needStripe(deps);
  const sequelize = BillingAccount.sequelize!;
  return sequelize.transaction(async (transaction) => {
    const account = await lockAccount(workspaceId, transaction);
    if (LIVE.includes(account.status)) throw new HttpError(409, 'conflict', `This workspace is already on the ${PLANS.team.name} plan.`, [{ path: 'plan', message: account.status }]);
    if (account.checkoutSessionId && account.checkoutUrl && account.checkoutExpiresAt && account.checkoutExpiresAt.getTime() > Date.now() + 5 * 60_000) {
      const open = await callStripe(() => stripe.checkout.sessions.retrieve(account.checkoutSessionId!));
      if (open.status === 'open') return { url: account.checkoutUrl, reused: true };
      if (open.status === 'complete') throw new HttpError(409, 'conflict', 'The payment has gone through; the plan changes as soon as the payment service confirms it (usually within seconds).', [{ path: 'plan', message: 'checkout complete' }]);
    }
    const [workspace, user, usage] = await Promise.all([Workspace.findByPk(workspaceId, { transaction }), User.findByPk(userId, { transaction }), usageOf(workspaceId, transaction)]);
    if (!account.customerId) {
      const customer = await callStripe(() =>
        stripe.customers.create(
          { name: workspace?.name ?? `Workspace ${workspaceId}`, email: user?.email, metadata: { workspace_id: String(workspaceId) } },
          // The same key if this transaction rolls back and the admin tries again: still one customer.
          { idempotencyKey: `rotaloom-customer-${workspaceId}` },
        ),
      );
      account.customerId = customer.id;
    }
    const price = await callStripe(() => teamPriceId(stripe, config));
    const quantity = Math.max(1, usage.people);
    const session = await callStripe(() =>
      stripe.checkout.sessions.create(
        {
          mode: 'subscription',
          customer: account.customerId!,
          client_reference_id: String(workspaceId),
          line_items: [{ price, quantity }],
          subscription_data: {
            ...(account.trialEnd ? {} : { trial_period_days: PLANS.team.trialDays }),
            metadata: { workspace_id: String(workspaceId) },
          },
          metadata: { workspace_id: String(workspaceId) },
          success_url: `${deps.publicUrl}/billing?checkout=done`,
          cancel_url: `${deps.publicUrl}/billing?checkout=cancelled`,
        },
        { idempotencyKey: `rotaloom-checkout-${workspaceId}-${randomUUID()}` },
      ),
    );
    if (!session.url) throw new HttpError(502, 'payment_service_unavailable', 'The payment service did not return a checkout page; nothing was charged. Please try again.');
    account.checkoutSessionId = session.id;
    account.checkoutUrl = session.url;
    account.checkoutExpiresAt = new Date(session.expires_at * 1000);
    await account.save({ transaction });
    return { url: session.url, reused: false };
  });
}

function liveAccount(account: BillingAccount | null): BillingAccount & { subscriptionId: string; subscriptionItemId: string } {
  if (!account || !LIVE.includes(account.status)) throw new HttpError(409, 'conflict', `This workspace is not on the ${PLANS.team.name} plan.`, [{ path: 'plan', message: account?.status ?? 'none' }]);
  if (!account.subscriptionId || !account.subscriptionItemId) {
    throw new HttpError(409, 'conflict', 'This workspace’s plan was set up without the payment service (the demo), so there is nothing to change there.', [{ path: 'plan', message: 'no subscription' }]);
  }
  return account as BillingAccount & { subscriptionId: string; subscriptionItemId: string };
}

/** The new monthly price and what the next invoice will be if the seats change to `quantity`; nothing changes yet. */
export async function previewSeats(workspaceId: number, quantity: number, deps: BillingDeps) {
  const { stripe } = needStripe(deps);
  const account = liveAccount(await BillingAccount.findByPk(workspaceId));
  const preview = await callStripe(() =>
    stripe.invoices.createPreview({
      customer: account.customerId!,
      subscription: account.subscriptionId,
      subscription_details: { items: [{ id: account.subscriptionItemId, quantity }], proration_behavior: 'create_prorations' },
    }),
  );
  const adjustment = preview.lines.data.filter((l) => l.parent?.subscription_item_details?.proration).reduce((s, l) => s + l.amount, 0);
  return {
    quantity,
    currentQuantity: account.quantity,
    currentMonthly: monthlyPrice(account.quantity),
    newMonthly: monthlyPrice(quantity),
    currency: PLANS.team.seatPrice!.currency,
    nextInvoice: { amount: preview.amount_due, adjustment, date: preview.next_payment_attempt ? new Date(preview.next_payment_attempt * 1000).toISOString() : iso(account.currentPeriodEnd) },
    trialing: account.status === 'trialing',
  };
}

/** Applies a seat count to the subscription (prorated on the next invoice); the workspace row is locked meanwhile. */
export async function applySeats(workspaceId: number, quantity: number, deps: BillingDeps) {
  const { stripe } = needStripe(deps);
  return BillingAccount.sequelize!.transaction(async (transaction) => {
    const account = liveAccount(await lockAccount(workspaceId, transaction));
    if (account.quantity === quantity) return { quantity, changed: false };
    const sub = await callStripe(() =>
      stripe.subscriptions.update(account.subscriptionId, { items: [{ id: account.subscriptionItemId, quantity }], proration_behavior: 'create_prorations' }, { idempotencyKey: `rotaloom-seats-${account.subscriptionId}-${randomUUID()}` }),
    );
    account.quantity = sub.items.data[0]?.quantity ?? quantity;
    await account.save({ transaction });
    return { quantity: account.quantity, changed: true };
  });
}

/** Stop at the end of the paid period (true), or keep the plan after all (false). */
export async function setCancelAtPeriodEnd(workspaceId: number, atPeriodEnd: boolean, deps: BillingDeps) {
  const { stripe } = needStripe(deps);
  return BillingAccount.sequelize!.transaction(async (transaction) => {
    const account = liveAccount(await lockAccount(workspaceId, transaction));
    const sub = await callStripe(() => stripe.subscriptions.update(account.subscriptionId, { cancel_at_period_end: atPeriodEnd }));
    account.cancelAtPeriodEnd = sub.cancel_at_period_end;
    await account.save({ transaction });
    return { cancelAtPeriodEnd: account.cancelAtPeriodEnd, currentPeriodEnd: iso(account.currentPeriodEnd) };
  });
}

export async function openPortal(workspaceId: number, deps: BillingDeps): Promise<{ url: string }> {
  const { stripe } = needStripe(deps);
  const account = await BillingAccount.findByPk(workspaceId);
  if (!account?.customerId) throw new HttpError(409, 'conflict', 'This workspace has no payment details yet: start the Team plan first.', [{ path: 'plan', message: 'no customer' }]);
  const session = await callStripe(() => stripe.billingPortal.sessions.create({ customer: account.customerId!, return_url: `${deps.publicUrl}/billing` }));
  return { url: session.url };
}

export async function listInvoices(workspaceId: number, limit: number, deps: BillingDeps) {
  const account = await BillingAccount.findByPk(workspaceId);
  if (!account?.customerId) return { items: [] };
  const { stripe } = needStripe(deps);
  const list = await callStripe(() => stripe.invoices.list({ customer: account.customerId!, limit }));
  return {
    items: list.data.map((i) => ({
      id: i.id,
      number: i.number ?? null,
      status: i.status ?? 'draft',
      amountDue: i.amount_due,
      amountPaid: i.amount_paid,
      total: i.total,
      currency: i.currency,
      created: new Date(i.created * 1000).toISOString(),
      periodStart: new Date(i.period_start * 1000).toISOString(),
      periodEnd: new Date(i.period_end * 1000).toISOString(),
      url: i.hosted_invoice_url ?? null,
    })),
  };
}

/** Used by the demo seed: a workspace on the team plan without a subscription at the payment service. */
export async function grantTeamPlan(workspaceId: number, seats: number, transaction?: Transaction): Promise<void> {
  const periodEnd = new Date(Date.now() + 30 * 86_400_000);
  await BillingAccount.create({ workspaceId, status: 'active', quantity: seats, currentPeriodEnd: periodEnd }, { transaction });
}

export { planForStatus };
