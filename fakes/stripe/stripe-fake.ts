import http from 'node:http';
import { createHmac, randomBytes } from 'node:crypto';
import type { AddressInfo } from 'node:net';
import { arr, obj, parseStripeForm, str, strings, type FormValue } from './form';

/**
 * A local stand-in for the part of the payment service's HTTP API Rotaloom calls through the
 * official `stripe` SDK: customers, prices, checkout sessions, subscriptions (quantity changes,
 * cancel at period end, cancel now), billing portal sessions and invoices (list, preview). It has
 * a checkout page and a portal page of its own, and sends webhook events signed with the
 * documented scheme: header `Stripe-Signature: t=<unix>,v1=<hex HMAC-SHA256(secret, "<t>.<body>")>`.
 *
 * Test cards (the payment service's published test numbers): 4242 4242 4242 4242 succeeds,
 * 4000 0000 0000 0002 is declined. 4000 0000 0000 0341 is accepted at checkout but its renewals fail.
 */
export const FAKE_STRIPE_KEYS = {
  secretKey: 'sk_test_rotaloom_local_fake',
  webhookSecret: 'whsec_rotaloom_local_fake_secret',
};
export const TEST_CARDS = { success: '4242424242424242', decline: '4000000000000002', failsLater: '4000000000000341' } as const;
const API_VERSION = '2026-10-28.endive';

export interface StripeFake {
  port: number;
  url: string;
  /** Where events are posted; set once the app's address is known. */
  webhookUrl: string | null;
  /** Environment pointing the server's SDK at this fake. */
  env: Record<string, string>;
  /** Delivered events, oldest first, with the HTTP status the webhook answered. */
  deliveries: Array<{ eventId: string; type: string; status: number | null; attempts: number }>;
  /** True: API calls fail as if the service were unreachable (the socket is dropped). */
  offline: boolean;
  /** Resolves when every event queued so far has been delivered (or given up on). */
  settled(): Promise<void>;
  stop(): Promise<void>;
}

type Json = Record<string, unknown>;
const now = () => Math.floor(Date.now() / 1000);
const DAY = 86_400;
const MONTH = 30 * DAY;
const newId = (prefix: string) => `${prefix}_${randomBytes(12).toString('base64url').replace(/[-_]/g, 'x')}`;
const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] ?? c);

class StripeApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly type = 'invalid_request_error',
    readonly extra: Json = {},
  ) {
    super(message);
  }
}
const missing = (what: string, id: string) => new StripeApiError(404, `No such ${what}: '${id}'`, 'invalid_request_error', { code: 'resource_missing', param: 'id' });

interface Card {
  last4: string;
  failsRenewals: boolean;
}

export async function startStripeFake(options: { port?: number; webhookUrl?: string; secretKey?: string; webhookSecret?: string } = {}): Promise<StripeFake> {
  const secretKey = options.secretKey ?? FAKE_STRIPE_KEYS.secretKey;
  const webhookSecret = options.webhookSecret ?? FAKE_STRIPE_KEYS.webhookSecret;
  const customers = new Map<string, Json>();
  const prices = new Map<string, Json>();
  const sessions = new Map<string, Json & { _lineItems: Array<{ price: string; quantity: number }>; _subscriptionData: Json }>();
  const subscriptions = new Map<string, Json & { _pendingProration: number }>();
  const invoices = new Map<string, Json>();
  const portals = new Map<string, Json>();
  const cards = new Map<string, Card>(); // by customer
  const idempotent = new Map<string, { status: number; body: unknown }>();
  let invoiceCounter = 0;
  let baseUrl = '';

  // ---- webhook delivery: one queue, in order, with a few retries ----
  let queue: Promise<void> = Promise.resolve();
  const fake: StripeFake = {
    port: 0,
    url: '',
    webhookUrl: options.webhookUrl ?? null,
    env: {},
    deliveries: [],
    offline: false,
    settled: () => queue,
    stop: async () => {},
  };

  function sign(payload: string, t = now()): string {
    const v1 = createHmac('sha256', webhookSecret).update(`${t}.${payload}`, 'utf8').digest('hex');
    return `t=${t},v1=${v1}`;
  }

  function emit(type: string, object: Json, previous?: Json): void {
    const event = {
      id: newId('evt'),
      object: 'event',
      api_version: API_VERSION,
      created: now(),
      data: { object: structuredClone(strip(object)), ...(previous ? { previous_attributes: previous } : {}) },
      livemode: false,
      pending_webhooks: 1,
      request: { id: null, idempotency_key: null },
      type,
    };
    const record = { eventId: event.id, type, status: null as number | null, attempts: 0 };
    fake.deliveries.push(record);
    const payload = JSON.stringify(event, null, 2);
    queue = queue.then(async () => {
      for (let attempt = 1; attempt <= 4; attempt++) {
        if (!fake.webhookUrl) return;
        record.attempts = attempt;
        try {
          const res = await fetch(fake.webhookUrl, { method: 'POST', headers: { 'content-type': 'application/json; charset=utf-8', 'stripe-signature': sign(payload), 'user-agent': 'Rotaloom-Stripe-Fake/1.0' }, body: payload, signal: AbortSignal.timeout(10_000) });
          record.status = res.status;
          await res.arrayBuffer();
          if (res.ok) return;
        } catch {
          record.status = null;
        }
        await new Promise((r) => setTimeout(r, 150 * attempt));
      }
    });
  }

  /** Internal fields start with `_` and never leave the fake. */
  function strip(o: Json): Json {
    return Object.fromEntries(Object.entries(o).filter(([k]) => !k.startsWith('_')));
  }

  // ---- objects ----
  function price(id: string): Json {
    const p = prices.get(id);
    if (!p) throw missing('price', id);
    return p;
  }

  function makeInvoice(sub: Json, amount: number, status: 'paid' | 'open', reason: string, periodStart: number, periodEnd: number, lines: Json[]): Json {
    const id = newId('in');
    const inv: Json = {
      id,
      object: 'invoice',
      customer: sub.customer,
      number: `RTL-${String(++invoiceCounter).padStart(4, '0')}`,
      status,
      billing_reason: reason,
      collection_method: 'charge_automatically',
      currency: sub.currency,
      amount_due: amount,
      amount_paid: status === 'paid' ? amount : 0,
      amount_remaining: status === 'paid' ? 0 : amount,
      subtotal: amount,
      total: amount,
      created: now(),
      period_start: periodStart,
      period_end: periodEnd,
      hosted_invoice_url: `${baseUrl}/invoice/${id}`,
      invoice_pdf: null,
      livemode: false,
      attempt_count: 1,
      lines: { object: 'list', data: lines, has_more: false, url: `/v1/invoices/${id}/lines` },
      parent: { type: 'subscription_details', quote_details: null, subscription_details: { subscription: sub.id, metadata: sub.metadata } },
      status_transitions: { paid_at: status === 'paid' ? now() : null, finalized_at: now() },
    };
    invoices.set(id, inv);
    sub.latest_invoice = id;
    return inv;
  }

  function line(description: string, amount: number, quantity: number, start: number, end: number, proration: boolean, priceId: string): Json {
    return {
      id: newId('il'),
      object: 'line_item',
      amount,
      currency: 'gbp',
      description,
      quantity,
      period: { start, end },
      pricing: { type: 'price_details', price_details: { price: priceId, product: null }, unit_amount_decimal: null },
      parent: { type: 'subscription_item_details', subscription_item_details: { proration, subscription_item: null, subscription: null }, invoice_item_details: null },
    };
  }

  function item(sub: Json): Json {
    return (sub.items as { data: Json[] }).data[0];
  }

  function subscriptionFor(id: string) {
    const s = subscriptions.get(id);
    if (!s) throw missing('subscription', id);
    return s;
  }

  function createSubscription(session: Json & { _lineItems: Array<{ price: string; quantity: number }>; _subscriptionData: Json }, card: Card): Json {
    const li = session._lineItems[0];
    const p = price(li.price);
    const trialDays = Number(session._subscriptionData.trial_period_days ?? 0);
    const start = now();
    const trialEnd = trialDays > 0 ? start + trialDays * DAY : null;
    const periodEnd = trialEnd ?? start + MONTH;
    const id = newId('sub');
    const sub = {
      id,
      object: 'subscription',
      customer: session.customer,
      status: trialEnd ? 'trialing' : 'active',
      currency: p.currency,
      created: start,
      start_date: start,
      billing_cycle_anchor: periodEnd,
      cancel_at_period_end: false,
      cancel_at: null,
      canceled_at: null,
      ended_at: null,
      trial_start: trialEnd ? start : null,
      trial_end: trialEnd,
      collection_method: 'charge_automatically',
      livemode: false,
      metadata: strings(session._subscriptionData.metadata as FormValue),
      latest_invoice: null,
      items: {
        object: 'list',
        has_more: false,
        url: `/v1/subscription_items?subscription=${id}`,
        data: [{ id: newId('si'), object: 'subscription_item', subscription: id, price: p, quantity: li.quantity, current_period_start: start, current_period_end: periodEnd, created: start, metadata: {} }],
      },
      _pendingProration: 0,
    };
    subscriptions.set(id, sub);
    cards.set(String(session.customer), card);
    const amount = trialEnd ? 0 : Number(p.unit_amount) * li.quantity;
    const desc = trialEnd ? `Trial period for Rotaloom Team (${li.quantity} × seat)` : `${li.quantity} × Rotaloom Team seat (per month)`;
    makeInvoice(sub, amount, 'paid', 'subscription_create', start, periodEnd, [line(desc, amount, li.quantity, start, periodEnd, false, String(p.id))]);
    return sub;
  }

  /** Moves a subscription into its next period: an invoice, paid or not depending on the card. */
  function renew(sub: Json & { _pendingProration: number }, forceOutcome?: 'paid' | 'failed'): void {
    const it = item(sub);
    const card = cards.get(String(sub.customer));
    const outcome = forceOutcome ?? (card?.failsRenewals ? 'failed' : 'paid');
    const start = Number(it.current_period_end);
    const end = start + MONTH;
    const unit = Number((it.price as Json).unit_amount);
    const amount = unit * Number(it.quantity) + sub._pendingProration;
    const lines = [line(`${it.quantity} × Rotaloom Team seat (per month)`, unit * Number(it.quantity), Number(it.quantity), start, end, false, String((it.price as Json).id))];
    if (sub._pendingProration) lines.push(line('Adjustment for seats changed during the last period', sub._pendingProration, 1, start - MONTH, start, true, String((it.price as Json).id)));
    sub._pendingProration = 0;
    const previous = { status: sub.status };
    it.current_period_start = start;
    it.current_period_end = end;
    const inv = makeInvoice(sub, amount, outcome === 'paid' ? 'paid' : 'open', 'subscription_cycle', start, end, lines);
    if (sub.cancel_at_period_end) {
      cancelNow(sub);
      return;
    }
    sub.status = outcome === 'paid' ? 'active' : 'past_due';
    emit(outcome === 'paid' ? 'invoice.paid' : 'invoice.payment_failed', inv);
    emit('customer.subscription.updated', sub, previous);
  }

  function cancelNow(sub: Json): void {
    sub.status = 'canceled';
    sub.canceled_at = now();
    sub.ended_at = now();
    emit('customer.subscription.deleted', sub);
  }

  function completeCheckout(session: Json & { _lineItems: Array<{ price: string; quantity: number }>; _subscriptionData: Json }, card: Card): void {
    const sub = createSubscription(session, card);
    session.status = 'complete';
    session.subscription = sub.id;
    session.payment_status = sub.status === 'trialing' ? 'no_payment_required' : 'paid';
    emit('customer.subscription.created', sub);
    emit('invoice.paid', invoices.get(String(sub.latest_invoice))!);
    emit('checkout.session.completed', session);
  }

  // ---- the API ----
  async function api(method: string, path: string, form: Record<string, FormValue>, query: URLSearchParams): Promise<[number, unknown]> {
    const seg = path.split('/').filter(Boolean).slice(1); // drop 'v1'
    const [resource, id, action] = seg;
    if (resource === 'customers') {
      if (method === 'POST' && !id) {
        const c = { id: newId('cus'), object: 'customer', created: now(), email: str(form.email) ?? null, name: str(form.name) ?? null, metadata: strings(form.metadata), livemode: false, invoice_settings: { default_payment_method: null } };
        customers.set(c.id, c);
        return [200, c];
      }
      if (method === 'GET' && id) {
        const c = customers.get(id);
        if (!c) throw missing('customer', id);
        return [200, c];
      }
    }
    if (resource === 'prices') {
      if (method === 'GET' && !id) {
        const keys = arr(parseStripeForm(query.toString()).lookup_keys).map(String);
        const data = [...prices.values()].filter((p) => (keys.length === 0 || keys.includes(String(p.lookup_key))) && (query.get('active') === null || String(p.active) === query.get('active')));
        return [200, { object: 'list', data, has_more: false, url: '/v1/prices' }];
      }
      if (method === 'POST' && !id) {
        const unit = Number(str(form.unit_amount));
        if (!Number.isInteger(unit) || unit < 0) throw new StripeApiError(400, 'Invalid integer: unit_amount', 'invalid_request_error', { param: 'unit_amount' });
        const lookup = str(form.lookup_key) ?? null;
        if (lookup) for (const p of prices.values()) if (p.lookup_key === lookup) p.lookup_key = null;
        const product = str(form.product) ?? newId('prod');
        const p = {
          id: newId('price'),
          object: 'price',
          active: true,
          billing_scheme: 'per_unit',
          created: now(),
          currency: str(form.currency) ?? 'gbp',
          livemode: false,
          lookup_key: lookup,
          metadata: strings(form.metadata),
          nickname: str(form.nickname) ?? null,
          product,
          recurring: { interval: str(obj(form.recurring).interval) ?? 'month', interval_count: 1, usage_type: 'licensed' },
          type: 'recurring',
          unit_amount: unit,
          unit_amount_decimal: String(unit),
          _productName: str(obj(form.product_data).name) ?? 'Product',
        };
        prices.set(p.id, p);
        return [200, strip(p)];
      }
      if (method === 'GET' && id) return [200, strip(price(id))];
    }
    if (resource === 'checkout' && id === 'sessions') {
      const sid = action;
      if (method === 'POST' && !sid) {
        if (str(form.mode) !== 'subscription') throw new StripeApiError(400, 'This fake supports mode=subscription only', 'invalid_request_error', { param: 'mode' });
        const items = arr(form.line_items).map((li) => ({ price: str(obj(li).price) ?? '', quantity: Number(str(obj(li).quantity) ?? 1) }));
        if (items.length !== 1) throw new StripeApiError(400, 'Exactly one line item is supported', 'invalid_request_error', { param: 'line_items' });
        price(items[0].price);
        if (!Number.isInteger(items[0].quantity) || items[0].quantity < 1) throw new StripeApiError(400, 'Invalid quantity', 'invalid_request_error', { param: 'line_items[0][quantity]' });
        const customer = str(form.customer) ?? null;
        if (customer && !customers.has(customer)) throw missing('customer', customer);
        const successUrl = str(form.success_url);
        if (!successUrl) throw new StripeApiError(400, 'Missing required param: success_url.', 'invalid_request_error', { param: 'success_url' });
        const cid = newId('cs_test');
        const s = {
          id: cid,
          object: 'checkout.session',
          mode: 'subscription',
          status: 'open',
          payment_status: 'unpaid',
          customer,
          client_reference_id: str(form.client_reference_id) ?? null,
          metadata: strings(form.metadata),
          subscription: null,
          success_url: successUrl,
          cancel_url: str(form.cancel_url) ?? null,
          url: `${baseUrl}/pay/${cid}`,
          created: now(),
          expires_at: now() + DAY,
          currency: price(items[0].price).currency,
          amount_total: Number(price(items[0].price).unit_amount) * items[0].quantity,
          livemode: false,
          _lineItems: items,
          _subscriptionData: obj(form.subscription_data) as Json,
        };
        sessions.set(cid, s);
        return [200, strip(s)];
      }
      if (sid) {
        const s = sessions.get(sid);
        if (!s) throw missing('checkout.session', sid);
        if (method === 'GET' && !seg[3]) return [200, strip(s)];
        if (method === 'POST' && seg[3] === 'expire') {
          if (s.status !== 'open') throw new StripeApiError(400, `Only open sessions can be expired; this one is ${s.status}`);
          s.status = 'expired';
          s.url = null;
          return [200, strip(s)];
        }
      }
    }
    if (resource === 'subscriptions' && id) {
      const sub = subscriptionFor(id);
      if (method === 'GET') return [200, strip(sub)];
      if (method === 'DELETE') {
        if (sub.status === 'canceled') throw new StripeApiError(400, 'This subscription is already canceled');
        cancelNow(sub);
        return [200, strip(sub)];
      }
      if (method === 'POST') {
        if (sub.status === 'canceled') throw new StripeApiError(400, 'A canceled subscription can only update its cancellation_details and metadata.');
        const previous: Json = {};
        const items = arr(form.items);
        if (items.length > 0) {
          const it = item(sub);
          const wanted = obj(items[0]);
          if (str(wanted.id) !== it.id) throw new StripeApiError(400, `No such subscription item: '${str(wanted.id)}'`, 'invalid_request_error', { param: 'items[0][id]' });
          const q = Number(str(wanted.quantity));
          if (!Number.isInteger(q) || q < 1) throw new StripeApiError(400, 'Invalid quantity', 'invalid_request_error', { param: 'items[0][quantity]' });
          if (q !== it.quantity) {
            previous.items = structuredClone(sub.items);
            if (sub.status === 'active' && str(form.proration_behavior) !== 'none') sub._pendingProration += proration(sub, q);
            it.quantity = q;
          }
        }
        if (form.cancel_at_period_end !== undefined) {
          const flag = str(form.cancel_at_period_end) === 'true';
          if (flag !== sub.cancel_at_period_end) {
            previous.cancel_at_period_end = sub.cancel_at_period_end;
            sub.cancel_at_period_end = flag;
            sub.cancel_at = flag ? item(sub).current_period_end : null;
          }
        }
        if (form.metadata) sub.metadata = { ...(sub.metadata as Json), ...strings(form.metadata) };
        if (Object.keys(previous).length > 0) emit('customer.subscription.updated', sub, previous);
        return [200, strip(sub)];
      }
    }
    if (resource === 'billing_portal' && id === 'sessions' && method === 'POST') {
      const customer = str(form.customer);
      if (!customer || !customers.has(customer)) throw missing('customer', customer ?? '');
      const p = { id: newId('bps'), object: 'billing_portal.session', customer, return_url: str(form.return_url) ?? null, created: now(), livemode: false, url: '' };
      p.url = `${baseUrl}/portal/${p.id}`;
      portals.set(p.id, p);
      return [200, p];
    }
    if (resource === 'invoices') {
      if (method === 'GET' && !id) {
        const customer = query.get('customer');
        const limit = Math.min(100, Number(query.get('limit') ?? 10));
        const all = [...invoices.values()].filter((i) => !customer || i.customer === customer).sort((a, b) => Number(b.created) - Number(a.created) || String(b.number).localeCompare(String(a.number)));
        return [200, { object: 'list', data: all.slice(0, limit), has_more: all.length > limit, url: '/v1/invoices' }];
      }
      if (method === 'POST' && id === 'create_preview') return [200, preview(form)];
      if (method === 'GET' && id) {
        const inv = invoices.get(id);
        if (!inv) throw missing('invoice', id);
        return [200, inv];
      }
    }
    throw new StripeApiError(404, `Unrecognized request URL (${method}: ${path}).`);
  }

  /** The charge for changing seats now until the period ends, pro rata by the second. */
  function proration(sub: Json, quantity: number): number {
    const it = item(sub);
    const start = Number(it.current_period_start);
    const end = Number(it.current_period_end);
    const left = Math.max(0, Math.min(1, (end - now()) / (end - start)));
    return Math.round((quantity - Number(it.quantity)) * Number((it.price as Json).unit_amount) * left);
  }

  function preview(form: Record<string, FormValue>): Json {
    const subId = str(form.subscription);
    if (!subId) throw new StripeApiError(400, 'Missing required param: subscription.', 'invalid_request_error', { param: 'subscription' });
    const sub = subscriptionFor(subId);
    const it = item(sub);
    const wanted = obj(arr(obj(form.subscription_details).items)[0]);
    const quantity = wanted.quantity !== undefined ? Number(str(wanted.quantity)) : Number(it.quantity);
    const unit = Number((it.price as Json).unit_amount);
    const end = Number(it.current_period_end);
    const lines: Json[] = [];
    let adjustment = sub._pendingProration;
    if (sub.status === 'active' && quantity !== it.quantity) adjustment += proration(sub, quantity);
    if (adjustment !== 0) lines.push(line('Adjustment for the seats changed in this period', adjustment, Math.abs(quantity - Number(it.quantity)), now(), end, true, String((it.price as Json).id)));
    lines.push(line(`${quantity} × Rotaloom Team seat (per month)`, unit * quantity, quantity, end, end + MONTH, false, String((it.price as Json).id)));
    const total = lines.reduce((s, l) => s + Number(l.amount), 0);
    return {
      id: `upcoming_${newId('in')}`,
      object: 'invoice',
      customer: sub.customer,
      status: 'draft',
      currency: sub.currency,
      amount_due: Math.max(0, total),
      subtotal: total,
      total,
      created: now(),
      period_start: Number(it.current_period_start),
      period_end: end,
      next_payment_attempt: end,
      livemode: false,
      lines: { object: 'list', data: lines, has_more: false, url: '/v1/invoices/upcoming/lines' },
      parent: { type: 'subscription_details', subscription_details: { subscription: sub.id } },
    };
  }

  // ---- pages ----
  function page(title: string, body: string): string {
    return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1"><link rel="icon" href="data:,">
<title>${escapeHtml(title)} · local payment test page</title>
<style>body{font-family:system-ui,sans-serif;max-width:460px;margin:0 auto;padding:16px;color:#1b1f24;background:#f3f4f6}
main{background:#fff;border-radius:12px;padding:20px;box-shadow:0 1px 3px rgba(0,0,0,.12)}h1{font-size:21px;margin:0 0 12px}
.banner{font-size:13px;background:#fff4d6;border:1px solid #e7c96b;padding:8px 12px;border-radius:8px;margin-bottom:12px}
label{display:block;margin:12px 0 4px;font-weight:600}input{width:100%;box-sizing:border-box;padding:10px;font:inherit;border:1px solid #9aa1ab;border-radius:6px}
.row{display:flex;gap:12px}.row>div{flex:1}button{width:100%;margin-top:16px;padding:12px;font:inherit;font-weight:700;border:0;border-radius:8px;background:#14532d;color:#fff;cursor:pointer}
button.secondary{background:#fff;color:#14532d;border:1px solid #14532d}.err{background:#fde2e1;border-left:4px solid #b42318;padding:8px 12px;margin:12px 0;border-radius:4px}
.sum{display:flex;justify-content:space-between;border-top:1px solid #e5e7eb;padding:8px 0}small{color:#555}a{color:#14532d}</style></head>
<body><p class="banner">Local test stand-in for the payment service. No real card is charged. Test cards: 4242 4242 4242 4242 (succeeds), 4000 0000 0000 0002 (declined).</p><main>${body}</main></body></html>`;
  }

  function checkoutPage(s: Json & { _lineItems: Array<{ price: string; quantity: number }>; _subscriptionData: Json }, error?: string): string {
    const p = price(s._lineItems[0].price);
    const q = s._lineItems[0].quantity;
    const trial = Number(s._subscriptionData.trial_period_days ?? 0);
    const customer = s.customer ? customers.get(String(s.customer)) : null;
    const money = (n: number) => new Intl.NumberFormat('en-GB', { style: 'currency', currency: String(p.currency).toUpperCase() }).format(n / 100);
    return page(
      'Pay',
      `<h1>${escapeHtml(String(p._productName ?? 'Subscription'))}</h1>
<div class="sum"><span>${q} seat${q === 1 ? '' : 's'} × ${money(Number(p.unit_amount))}</span><span>${money(Number(p.unit_amount) * q)} / month</span></div>
${trial ? `<div class="sum"><span>Free for the first ${trial} days</span><strong>${money(0)} today</strong></div>` : ''}
${error ? `<p class="err" role="alert">${escapeHtml(error)}</p>` : ''}
<form method="post" action="/pay/${escapeHtml(String(s.id))}">
<label for="email">E-mail</label><input id="email" name="email" type="email" value="${escapeHtml(String(customer?.email ?? ''))}" required>
<label for="card">Card number</label><input id="card" name="card" inputmode="numeric" autocomplete="off" placeholder="4242 4242 4242 4242" required>
<div class="row"><div><label for="expiry">Expiry (MM/YY)</label><input id="expiry" name="expiry" placeholder="12/34" required></div><div><label for="cvc">CVC</label><input id="cvc" name="cvc" inputmode="numeric" placeholder="123" required></div></div>
<label for="holder">Name on card</label><input id="holder" name="holder" required>
<button type="submit">${trial ? 'Start free trial' : 'Subscribe'}</button></form>
${s.cancel_url ? `<form method="get" action="${escapeHtml(String(s.cancel_url))}"><button class="secondary" type="submit">Go back without paying</button></form>` : ''}`,
    );
  }

  function checkCard(form: URLSearchParams): { card?: Card; error?: string } {
    const number = (form.get('card') ?? '').replace(/[\s-]/g, '');
    const expiry = (form.get('expiry') ?? '').trim();
    const m = /^(\d{2})\s*\/\s*(\d{2})$/.exec(expiry);
    if (!m || Number(m[1]) < 1 || Number(m[1]) > 12) return { error: 'Enter the expiry date as MM/YY.' };
    const expires = new Date(Date.UTC(2000 + Number(m[2]), Number(m[1]), 1));
    if (expires.getTime() <= Date.now()) return { error: 'This card has expired.' };
    if (!/^\d{3,4}$/.test((form.get('cvc') ?? '').trim())) return { error: 'Enter the 3 or 4 digit security code.' };
    if (number === TEST_CARDS.decline) return { error: 'Your card was declined. Try another card.' };
    if (number === TEST_CARDS.success) return { card: { last4: number.slice(-4), failsRenewals: false } };
    if (number === TEST_CARDS.failsLater) return { card: { last4: number.slice(-4), failsRenewals: true } };
    return { error: 'This test page accepts only the test card numbers shown above.' };
  }

  function portalPage(p: Json, note?: string): string {
    const subs = [...subscriptions.values()].filter((s) => s.customer === p.customer).sort((a, b) => Number(b.created) - Number(a.created));
    const sub = subs[0];
    const card = cards.get(String(p.customer));
    const base = `/portal/${escapeHtml(String(p.id))}`;
    const rows = sub
      ? `<div class="sum"><span>Status</span><strong data-status="${escapeHtml(String(sub.status))}">${escapeHtml(String(sub.status).replace('_', ' '))}</strong></div>
<div class="sum"><span>Seats</span><span>${item(sub).quantity}</span></div>
<div class="sum"><span>${sub.cancel_at_period_end ? 'Ends on' : 'Renews on'}</span><span>${new Date(Number(item(sub).current_period_end) * 1000).toISOString().slice(0, 10)}</span></div>
<div class="sum"><span>Card</span><span>${card ? `ending ${card.last4}` : 'none'}</span></div>`
      : '<p>No subscription.</p>';
    const actions =
      sub && sub.status !== 'canceled'
        ? `<form method="post" action="${base}/card"><label for="card">New card number</label><input id="card" name="card" inputmode="numeric" required>
<div class="row"><div><label for="expiry">Expiry (MM/YY)</label><input id="expiry" name="expiry" required></div><div><label for="cvc">CVC</label><input id="cvc" name="cvc" required></div></div>
<button type="submit">Save card${sub.status === 'past_due' ? ' and pay what is due' : ''}</button></form>
<form method="post" action="${base}/${sub.cancel_at_period_end ? 'resume' : 'cancel'}"><button class="secondary" type="submit">${sub.cancel_at_period_end ? 'Keep the subscription' : 'Stop at the end of this period'}</button></form>`
        : '';
    return page('Manage subscription', `<h1>Your subscription</h1>${note ? `<p class="err" role="alert">${escapeHtml(note)}</p>` : ''}${rows}${actions}
${p.return_url ? `<p><a href="${escapeHtml(String(p.return_url))}">Back to Rotaloom</a></p>` : ''}`);
  }

  async function readBody(req: http.IncomingMessage): Promise<string> {
    let data = '';
    req.setEncoding('utf8');
    for await (const chunk of req) {
      data += chunk;
      if (data.length > 256_000) throw new StripeApiError(413, 'Request too large');
    }
    return data;
  }

  function send(res: http.ServerResponse, status: number, body: unknown): void {
    res.writeHead(status, { 'content-type': 'application/json', 'request-id': newId('req'), 'stripe-version': API_VERSION });
    res.end(JSON.stringify(body));
  }
  const html = (res: http.ServerResponse, status: number, body: string) => {
    res.writeHead(status, { 'content-type': 'text/html; charset=utf-8', 'cache-control': 'no-store' });
    res.end(body);
  };
  const redirect = (res: http.ServerResponse, to: string) => {
    res.writeHead(303, { location: to });
    res.end();
  };

  const server = http.createServer((req, res) => {
    const url = new URL(req.url ?? '/', 'http://127.0.0.1');
    const run = async () => {
      const body = await readBody(req);
      if (url.pathname.startsWith('/v1/')) {
        if (fake.offline) {
          req.socket.destroy();
          return;
        }
        const auth = /^Bearer (.+)$/.exec(req.headers.authorization ?? '')?.[1];
        if (auth !== secretKey) return send(res, 401, { error: { type: 'invalid_request_error', message: 'Invalid API Key provided.' } });
        const key = req.method === 'POST' ? req.headers['idempotency-key'] : undefined;
        const cacheKey = typeof key === 'string' ? `${key}|${url.pathname}` : null;
        if (cacheKey && idempotent.has(cacheKey)) {
          const hit = idempotent.get(cacheKey)!;
          return send(res, hit.status, hit.body);
        }
        try {
          const [status, out] = await api(req.method ?? 'GET', url.pathname, parseStripeForm(body), url.searchParams);
          if (cacheKey) idempotent.set(cacheKey, { status, body: out });
          return send(res, status, out);
        } catch (err) {
          if (err instanceof StripeApiError) return send(res, err.status, { error: { type: err.type, message: err.message, ...err.extra } });
          throw err;
        }
      }
      const form = new URLSearchParams(body);
      const payMatch = /^\/pay\/([\w]+)$/.exec(url.pathname);
      if (payMatch) {
        const s = sessions.get(payMatch[1]);
        if (!s) return html(res, 404, page('Not found', '<h1>This payment link is not valid.</h1>'));
        if (s.status === 'complete') return html(res, 200, page('Done', `<h1>This subscription is already paid for.</h1><p><a href="${escapeHtml(String(s.success_url).replace('{CHECKOUT_SESSION_ID}', String(s.id)))}">Back to Rotaloom</a></p>`));
        if (s.status === 'expired' || Number(s.expires_at) < now()) return html(res, 410, page('Expired', '<h1>This payment link has expired.</h1><p>Start again from Rotaloom.</p>'));
        if (req.method === 'GET') return html(res, 200, checkoutPage(s));
        const checked = checkCard(form);
        if (!checked.card) return html(res, 402, checkoutPage(s, checked.error));
        const email = form.get('email');
        if (s.customer && email) (customers.get(String(s.customer)) as Json).email = email;
        completeCheckout(s, checked.card);
        return redirect(res, String(s.success_url).replace('{CHECKOUT_SESSION_ID}', String(s.id)));
      }
      const portalMatch = /^\/portal\/([\w]+)(?:\/(card|cancel|resume))?$/.exec(url.pathname);
      if (portalMatch) {
        const p = portals.get(portalMatch[1]);
        if (!p) return html(res, 404, page('Not found', '<h1>This link is not valid.</h1>'));
        const action = portalMatch[2];
        if (req.method === 'GET' || !action) return html(res, 200, portalPage(p));
        const sub = [...subscriptions.values()].filter((s) => s.customer === p.customer && s.status !== 'canceled').sort((a, b) => Number(b.created) - Number(a.created))[0];
        if (!sub) return html(res, 409, portalPage(p, 'There is no subscription to change.'));
        if (action === 'cancel' || action === 'resume') {
          const flag = action === 'cancel';
          if (sub.cancel_at_period_end !== flag) {
            const previous = { cancel_at_period_end: sub.cancel_at_period_end };
            sub.cancel_at_period_end = flag;
            sub.cancel_at = flag ? item(sub).current_period_end : null;
            emit('customer.subscription.updated', sub, previous);
          }
          return redirect(res, `/portal/${p.id}`);
        }
        const checked = checkCard(form);
        if (!checked.card) return html(res, 402, portalPage(p, checked.error));
        cards.set(String(p.customer), checked.card);
        // Paying what is overdue with the new card brings the subscription back.
        if (sub.status === 'past_due' && !checked.card.failsRenewals) {
          for (const inv of invoices.values()) {
            if (inv.customer === p.customer && inv.status === 'open') {
              Object.assign(inv, { status: 'paid', amount_paid: inv.amount_due, amount_remaining: 0, status_transitions: { paid_at: now(), finalized_at: inv.created } });
              emit('invoice.paid', inv);
            }
          }
          const previous = { status: sub.status };
          sub.status = 'active';
          emit('customer.subscription.updated', sub, previous);
        }
        return redirect(res, `/portal/${p.id}`);
      }
      const invoiceMatch = /^\/invoice\/([\w]+)$/.exec(url.pathname);
      if (invoiceMatch && req.method === 'GET') {
        const inv = invoices.get(invoiceMatch[1]);
        if (!inv) return html(res, 404, page('Not found', '<h1>No such invoice.</h1>'));
        const lines = (inv.lines as { data: Json[] }).data.map((l) => `<div class="sum"><span>${escapeHtml(String(l.description))}</span><span>${(Number(l.amount) / 100).toFixed(2)}</span></div>`).join('');
        return html(res, 200, page(`Invoice ${inv.number}`, `<h1>Invoice ${escapeHtml(String(inv.number))}</h1><p>Status: ${escapeHtml(String(inv.status))}</p>${lines}<div class="sum"><strong>Total</strong><strong>${(Number(inv.total) / 100).toFixed(2)} ${String(inv.currency).toUpperCase()}</strong></div>`));
      }
      // Test controls (never part of the real service): move time on, or look at the state.
      const renewMatch = /^\/_fake\/subscriptions\/([\w]+)\/renew$/.exec(url.pathname);
      if (renewMatch && req.method === 'POST') {
        const sub = subscriptions.get(renewMatch[1]);
        if (!sub) return send(res, 404, { error: { message: 'No such subscription' } });
        const outcome = form.get('outcome');
        renew(sub, outcome === 'failed' || outcome === 'paid' ? outcome : undefined);
        return send(res, 200, strip(sub));
      }
      if (url.pathname === '/_fake/state' && req.method === 'GET') {
        return send(res, 200, {
          customers: [...customers.values()],
          subscriptions: [...subscriptions.values()].map(strip),
          sessions: [...sessions.values()].map(strip),
          invoices: [...invoices.values()],
          deliveries: fake.deliveries,
        });
      }
      if (url.pathname === '/_fake/offline' && req.method === 'POST') {
        fake.offline = form.get('on') === '1';
        return send(res, 200, { offline: fake.offline });
      }
      if (url.pathname === '/favicon.ico') {
        res.writeHead(204);
        return res.end();
      }
      send(res, 404, { error: { type: 'invalid_request_error', message: `Unrecognized request URL (${req.method}: ${url.pathname}).` } });
    };
    run().catch((err: unknown) => {
      if (!res.headersSent) send(res, 500, { error: { type: 'api_error', message: err instanceof Error ? err.message : String(err) } });
    });
  });
  await new Promise<void>((resolve) => server.listen(options.port ?? 0, '127.0.0.1', resolve));
  fake.port = (server.address() as AddressInfo).port;
  fake.url = baseUrl = `http://127.0.0.1:${fake.port}`;
  fake.env = {
    ROTALOOM_STRIPE_SECRET_KEY: secretKey,
    ROTALOOM_STRIPE_WEBHOOK_SECRET: webhookSecret,
    ROTALOOM_STRIPE_HOST: '127.0.0.1',
    ROTALOOM_STRIPE_PORT: String(fake.port),
    ROTALOOM_STRIPE_PROTOCOL: 'http',
  };
  fake.stop = () =>
    new Promise<void>((resolve) => {
      server.closeAllConnections();
      server.close(() => resolve());
    });
  return fake;
}
