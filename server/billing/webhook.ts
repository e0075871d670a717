import type Stripe from 'stripe';
import { UniqueConstraintError, type Transaction } from 'sequelize';
import type { RequestHandler } from 'express';
import { HttpError } from '../http/errors';
import { Workspace } from '../db/models';
import { BillingAccount, BillingEvent } from './models';
import { lockAccount } from './service';
import { formatMoney, type SubscriptionStatus } from '../../shared/billing/plans';

const LIVE: SubscriptionStatus[] = ['trialing', 'active', 'past_due'];
const idOf = (v: string | { id: string } | null | undefined) => (typeof v === 'string' ? v : (v?.id ?? null));

/**
 * POST /api/billing/webhook. The body arrives raw (server/app.ts mounts express.raw for this path
 * before the JSON parser) because the signature covers the exact bytes. A bad or missing signature
 * is a 400 and touches nothing. Each event is stored under its id in the same transaction as its
 * effect, so a replayed event hits the primary key and changes nothing.
 */
export function webhookHandler(deps: { stripe: Stripe | null; webhookSecret: string | null }): RequestHandler {
  return async (req, res) => {
    if (!deps.stripe || !deps.webhookSecret) throw new HttpError(404, 'not_found', 'Payments are not set up on this server, so it takes no payment events');
    const signature = req.get('stripe-signature');
    if (!signature) throw new HttpError(400, 'bad_signature', 'The Stripe-Signature header is missing', [{ path: 'headers.stripe-signature', message: 'required' }]);
    if (!Buffer.isBuffer(req.body)) throw new HttpError(400, 'bad_request', 'The webhook body must be sent raw', [{ path: 'body', message: 'missing' }]);
    let event: Stripe.Event;
    try {
      event = deps.stripe.webhooks.constructEvent(req.body, signature, deps.webhookSecret);
    } catch (err) {
      throw new HttpError(400, 'bad_signature', `The webhook signature does not verify: ${(err instanceof Error ? err.message : String(err)).split('\n')[0].trim()}`, [{ path: 'headers.stripe-signature', message: 'does not verify' }]);
    }
    const result = await handleEvent(event);
    res.json({ received: true, ...result });
  };
}

export async function handleEvent(event: Stripe.Event): Promise<{ duplicate: boolean; outcome: string }> {
  const sequelize = BillingAccount.sequelize!;
  try {
    return await sequelize.transaction(async (transaction) => {
      // Insert first: a concurrent delivery of the same event waits here and then fails on the key.
      const row = await BillingEvent.create({ id: event.id, workspaceId: null, type: event.type, eventCreated: event.created, outcome: 'received', payload: JSON.stringify(event) }, { transaction });
      const { workspaceId, outcome } = await apply(event, transaction);
      row.workspaceId = workspaceId;
      row.outcome = outcome;
      await row.save({ transaction });
      return { duplicate: false, outcome };
    });
  } catch (err) {
    if (err instanceof UniqueConstraintError) return { duplicate: true, outcome: 'already handled' };
    throw err;
  }
}

async function workspaceFor(object: { metadata?: Stripe.Metadata | null; customer?: string | { id: string } | null }, subscriptionId: string | null, transaction: Transaction): Promise<number | null> {
  const fromMeta = Number(object.metadata?.workspace_id);
  if (Number.isInteger(fromMeta) && fromMeta > 0 && (await Workspace.count({ where: { id: fromMeta }, transaction })) > 0) return fromMeta;
  if (subscriptionId) {
    const bySub = await BillingAccount.findOne({ where: { subscriptionId }, transaction });
    if (bySub) return bySub.workspaceId;
  }
  const customer = idOf(object.customer);
  if (customer) {
    const byCustomer = await BillingAccount.findOne({ where: { customerId: customer }, transaction });
    if (byCustomer) return byCustomer.workspaceId;
  }
  return null;
}

async function apply(event: Stripe.Event, transaction: Transaction): Promise<{ workspaceId: number | null; outcome: string }> {
  switch (event.type) {
    case 'checkout.session.completed': {
      const session = event.data.object;
      const ref = Number(session.client_reference_id);
      const workspaceId = Number.isInteger(ref) && ref > 0 && (await Workspace.count({ where: { id: ref }, transaction })) > 0 ? ref : await workspaceFor(session, idOf(session.subscription), transaction);
      if (!workspaceId) return { workspaceId: null, outcome: 'ignored: no workspace' };
      const account = await lockAccount(workspaceId, transaction);
      if (account.checkoutSessionId === session.id) {
        account.checkoutSessionId = null;
        account.checkoutUrl = null;
        account.checkoutExpiresAt = null;
      }
      account.customerId ??= idOf(session.customer);
      const subscriptionId = idOf(session.subscription);
      if (subscriptionId && !account.subscriptionId) account.subscriptionId = subscriptionId;
      await account.save({ transaction });
      return { workspaceId, outcome: 'checkout completed' };
    }
    case 'customer.subscription.created':
    case 'customer.subscription.updated':
    case 'customer.subscription.deleted': {
      const sub = event.data.object;
      const workspaceId = await workspaceFor(sub, sub.id, transaction);
      if (!workspaceId) return { workspaceId: null, outcome: 'ignored: no workspace' };
      const account = await lockAccount(workspaceId, transaction);
      if (account.subscriptionId && account.subscriptionId !== sub.id && LIVE.includes(account.status)) {
        // A second subscription for a workspace that already has a live one is not adopted.
        return { workspaceId, outcome: `ignored: workspace already has ${account.subscriptionId}` };
      }
      if (account.subscriptionId === sub.id && account.subscriptionEventAt !== null && event.created < account.subscriptionEventAt) {
        return { workspaceId, outcome: 'ignored: older than the state already applied' };
      }
      // Event times have whole seconds: within one second, arrival order stands unless the
      // subscription's life rules the step out (nothing follows cancelled; once started, a
      // subscription never goes back to incomplete or trial). Past due → active is a payment
      // recovered and stands.
      const incoming = event.type === 'customer.subscription.deleted' ? 'canceled' : sub.status;
      if (account.subscriptionId === sub.id && event.created === account.subscriptionEventAt && cannotFollow(account.status, incoming)) {
        return { workspaceId, outcome: 'ignored: same second as the state already applied, and earlier in the subscription\'s life' };
      }
      const item = sub.items.data[0];
      account.subscriptionId = sub.id;
      account.subscriptionItemId = item?.id ?? null;
      account.customerId ??= idOf(sub.customer);
      account.status = (event.type === 'customer.subscription.deleted' ? 'canceled' : sub.status) as SubscriptionStatus;
      account.quantity = item?.quantity ?? 0;
      account.cancelAtPeriodEnd = sub.cancel_at_period_end;
      account.currentPeriodEnd = item?.current_period_end ? new Date(item.current_period_end * 1000) : null;
      if (sub.trial_end) account.trialEnd = new Date(sub.trial_end * 1000);
      account.subscriptionEventAt = event.created;
      if (account.status !== 'past_due') account.lastPaymentError = null;
      if (LIVE.includes(account.status)) {
        account.checkoutSessionId = null;
        account.checkoutUrl = null;
        account.checkoutExpiresAt = null;
      }
      await account.save({ transaction });
      return { workspaceId, outcome: `subscription ${account.status}` };
    }
    case 'invoice.paid':
    case 'invoice.payment_failed': {
      const invoice = event.data.object;
      const subscriptionId = idOf(invoice.parent?.subscription_details?.subscription ?? null);
      const workspaceId = await workspaceFor({ customer: invoice.customer, metadata: invoice.parent?.subscription_details?.metadata ?? null }, subscriptionId, transaction);
      if (!workspaceId) return { workspaceId: null, outcome: 'ignored: no workspace' };
      const account = await lockAccount(workspaceId, transaction);
      // An invoice event older than the subscription state already applied only counts if that
      // state agrees with it: a late failure must not mark a paid-up workspace, nor a late payment
      // clear a failure the subscription still shows.
      const late = account.subscriptionEventAt !== null && event.created < account.subscriptionEventAt;
      const troubled = PAYMENT_TROUBLE.includes(account.status);
      if (late && (event.type === 'invoice.payment_failed') !== troubled) {
        return { workspaceId, outcome: `ignored: older than the subscription state (${account.status})` };
      }
      if (event.type === 'invoice.payment_failed') {
        account.lastPaymentError = `The payment of ${formatMoney(invoice.amount_due, invoice.currency)} for invoice ${invoice.number ?? invoice.id} failed on ${new Date(event.created * 1000).toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' })}.`;
      } else {
        account.lastPaymentError = null;
      }
      await account.save({ transaction });
      return { workspaceId, outcome: event.type === 'invoice.paid' ? 'invoice paid' : 'payment failed' };
    }
    default:
      return { workspaceId: null, outcome: 'ignored: not an event Rotaloom uses' };
  }
}

const PAYMENT_TROUBLE: SubscriptionStatus[] = ['past_due', 'unpaid'];
const BEFORE_START: string[] = ['incomplete', 'incomplete_expired', 'trialing'];
const STARTED: string[] = ['active', 'past_due', 'unpaid', 'paused'];
function cannotFollow(current: string, incoming: string): boolean {
  if (current === incoming) return false;
  if (current === 'canceled') return true;
  return STARTED.includes(current) && BEFORE_START.includes(incoming);
}
