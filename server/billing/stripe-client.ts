import Stripe from 'stripe';
import type { Env } from '../env';
import { HttpError } from '../http/errors';
import { PLANS, TEAM_PRICE_LOOKUP_KEY } from '../../shared/billing/plans';

export type BillingConfig = NonNullable<Env['billing']>;

/**
 * The official SDK, pointed at the local fake when host/port/protocol are set and at the real
 * service otherwise. One network retry (the SDK resends POSTs with the same idempotency key) and a
 * short timeout, so an unreachable service fails a request in seconds, not minutes.
 */
export function createStripe(config: BillingConfig): Stripe {
  return new Stripe(config.secretKey, {
    ...(config.host ? { host: config.host } : {}),
    ...(config.port ? { port: config.port } : {}),
    ...(config.protocol ? { protocol: config.protocol } : {}),
    maxNetworkRetries: 1,
    timeout: 8000,
    appInfo: { name: 'Rotaloom' },
  });
}

const priceCache = new WeakMap<Stripe, Promise<string>>();

/** The team plan's per-seat monthly price: the configured id, else found by lookup key, else created once. */
export function teamPriceId(stripe: Stripe, config: BillingConfig): Promise<string> {
  if (config.priceId) return Promise.resolve(config.priceId);
  let cached = priceCache.get(stripe);
  if (!cached) {
    cached = (async () => {
      const found = await stripe.prices.list({ lookup_keys: [TEAM_PRICE_LOOKUP_KEY], active: true, limit: 1 });
      if (found.data[0]) return found.data[0].id;
      const seat = PLANS.team.seatPrice!;
      const created = await stripe.prices.create(
        {
          currency: seat.currency,
          unit_amount: seat.amount,
          recurring: { interval: seat.interval },
          lookup_key: TEAM_PRICE_LOOKUP_KEY,
          product_data: { name: `Rotaloom ${PLANS.team.name} (per rostered person)` },
        },
        { idempotencyKey: `rotaloom-price-${TEAM_PRICE_LOOKUP_KEY}-${seat.amount}-${seat.currency}` },
      );
      return created.id;
    })();
    // A failure must not stick: the next call tries again.
    cached.catch(() => priceCache.delete(stripe));
    priceCache.set(stripe, cached);
  }
  return cached;
}

/** Turns an SDK failure into an error the admin can read; the caller's transaction rolls back with it. */
export function paymentServiceError(err: unknown): HttpError {
  if (err instanceof HttpError) return err;
  if (err instanceof Stripe.errors.StripeConnectionError || err instanceof Stripe.errors.StripeAPIError || err instanceof Stripe.errors.StripeRateLimitError) {
    return new HttpError(503, 'payment_service_unavailable', 'The payment service could not be reached, so nothing was set up and nothing was charged. Your plan is unchanged; please try again in a few minutes.');
  }
  if (err instanceof Stripe.errors.StripeAuthenticationError || err instanceof Stripe.errors.StripePermissionError) {
    return new HttpError(503, 'payment_service_unavailable', 'Payments are not set up correctly on this server (the payment service refused its key). Nothing was charged.');
  }
  if (err instanceof Stripe.errors.StripeError) {
    return new HttpError(502, 'payment_service_unavailable', `The payment service refused the request: ${err.message}`);
  }
  return err as HttpError;
}

/** Runs one call to the payment service, reporting its failure in words. */
export async function callStripe<T>(fn: () => Promise<T>): Promise<T> {
  try {
    return await fn();
  } catch (err) {
    throw paymentServiceError(err);
  }
}
