/**
 * Rotaloom's plans, in one place: the server enforces these limits and the billing screen shows
 * them. Prices are in the currency's smallest unit (pence).
 */
export type PlanId = 'free' | 'team';

export interface PlanLimits {
  /** People who can be rostered in the workspace; null = no cap. */
  people: number | null;
  /**
   * Rosters that are still being worked on; null = no cap. A roster is *active* until it is
   * published (status `draft` or `solved`); published rosters stay readable and do not count.
   */
  activeRosters: number | null;
}

export interface Plan {
  id: PlanId;
  name: string;
  summary: string;
  limits: PlanLimits;
  /** Per rostered person per month; null for the free plan. */
  seatPrice: { amount: number; currency: string; interval: 'month' } | null;
  trialDays: number;
}

export const PLANS: Record<PlanId, Plan> = {
  free: {
    id: 'free',
    name: 'Starter',
    summary: 'For a small team trying Rotaloom: up to 12 people and one roster in progress at a time.',
    limits: { people: 12, activeRosters: 1 },
    seatPrice: null,
    trialDays: 0,
  },
  team: {
    id: 'team',
    name: 'Team',
    summary: 'Any number of people and rosters; you pay for each person on your rosters, month by month.',
    limits: { people: null, activeRosters: null },
    seatPrice: { amount: 400, currency: 'gbp', interval: 'month' },
    trialDays: 14,
  },
};

/** The stable lookup key of the team plan's per-seat monthly price at the payment service. */
export const TEAM_PRICE_LOOKUP_KEY = 'rotaloom_team_seat_monthly';

/** Subscription states as the payment service reports them; the ones we act on are listed in words. */
export type SubscriptionStatus = 'none' | 'incomplete' | 'trialing' | 'active' | 'past_due' | 'canceled' | 'unpaid' | 'incomplete_expired' | 'paused';

/** Which plan a subscription state gives: past_due keeps the team plan (data stays readable, new runs wait for payment). */
export function planForStatus(status: SubscriptionStatus): PlanId {
  return status === 'trialing' || status === 'active' || status === 'past_due' ? 'team' : 'free';
}

/** The code a limit error carries, so the client can show an upgrade prompt. */
export const PLAN_LIMIT_CODE = 'plan_limit';
export const PAYMENT_OVERDUE_CODE = 'payment_overdue';

export type LimitName = keyof PlanLimits;

export function formatMoney(amount: number, currency: string): string {
  return new Intl.NumberFormat('en-GB', { style: 'currency', currency: currency.toUpperCase() }).format(amount / 100);
}

/** The team plan's monthly price for this many seats. */
export function monthlyPrice(seats: number): number {
  return (PLANS.team.seatPrice?.amount ?? 0) * seats;
}
