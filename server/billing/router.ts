import type { Env } from '../env';
import { ADMIN_ONLY, ApiRoutes } from '../http/routes';
import { validate } from '../http/validate';
import { cancelBody, invoicesQuery, seatsBody } from '../../shared/billing/api';
import { createStripe } from './stripe-client';
import { applySeats, billingOverview, listInvoices, openPortal, previewSeats, setCancelAtPeriodEnd, startCheckout, type BillingDeps } from './service';
import { webhookHandler } from './webhook';
import { SeatSync, setSeatSync } from './seat-sync';

const ws = (req: { auth?: { workspaceId: number } }) => req.auth!.workspaceId;

/** The path the payment service posts events to; server/app.ts gives it a raw body and csrf.ts exempts it. */
export const WEBHOOK_PATH = '/api/billing/webhook';

/**
 * /api/billing: admins only (coordinators and staff never see billing), except the webhook,
 * which is public and trusted only through its signature.
 */
export function billingRouter(env: Env) {
  const stripe = env.billing ? createStripe(env.billing) : null;
  const deps: BillingDeps = { stripe, config: env.billing, publicUrl: env.publicUrl };
  setSeatSync(stripe && env.billing ? new SeatSync(stripe, env.billing, env.publicUrl) : null);

  const r = new ApiRoutes('/billing');
  r.post('/webhook', 'public', webhookHandler({ stripe, webhookSecret: env.billing?.webhookSecret ?? null }));
  r.get('/', ADMIN_ONLY, async (req, res) => {
    res.json(await billingOverview(ws(req), deps));
  });
  r.post('/checkout', ADMIN_ONLY, async (req, res) => {
    res.status(201).json(await startCheckout(ws(req), req.auth!.userId, deps));
  });
  r.post('/seats/preview', ADMIN_ONLY, validate({ body: seatsBody }), async (req, res) => {
    res.json(await previewSeats(ws(req), req.body.quantity, deps));
  });
  r.post('/seats', ADMIN_ONLY, validate({ body: seatsBody }), async (req, res) => {
    res.json(await applySeats(ws(req), req.body.quantity, deps));
  });
  r.post('/cancel', ADMIN_ONLY, validate({ body: cancelBody }), async (req, res) => {
    res.json(await setCancelAtPeriodEnd(ws(req), req.body.atPeriodEnd, deps));
  });
  r.post('/portal', ADMIN_ONLY, async (req, res) => {
    res.status(201).json(await openPortal(ws(req), deps));
  });
  r.get('/invoices', ADMIN_ONLY, validate({ query: invoicesQuery }), async (req, res) => {
    res.json(await listInvoices(ws(req), (req.query as unknown as { limit: number }).limit, deps));
  });
  return r.router;
}
