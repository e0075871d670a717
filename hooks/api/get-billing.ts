import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Plan, PlanId, SubscriptionStatus } from '@/shared/billing/plans';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** As server/billing/service.ts billingOverview answers it (admins only). */
export interface Billing {
  plan: Plan;
  status: SubscriptionStatus;
  configured: boolean;
  usage: { people: number; activeRosters: number };
  limits: { people: number | null; activeRosters: number | null };
  plans: Plan[];
  subscription: {
    managedByPaymentService: boolean;
    quantity: number;
    monthlyPrice: number;
    currency: string;
    trialEnd: string | null;
    currentPeriodEnd: string | null;
    cancelAtPeriodEnd: boolean;
  } | null;
  seatChange: { from: number; to: number } | null;
  pastDue: { message: string } | null;
  checkoutOpen: boolean;
  canStartTrial: boolean;
}

export type { PlanId };

export const getBilling = () => apiFetch<Billing>('/billing');

/** While a checkout has just finished, poll until the payment service's confirmation has arrived. */
export const billingQueryOptions = (waitingForCheckout = false) =>
  queryOptions({
    queryKey: keys.billing.plan.queryKey,
    queryFn: getBilling,
    refetchInterval: (query) => (waitingForCheckout && query.state.data?.plan.id !== 'team' ? 1000 : false),
  });

/** `enabled` false for anyone but admins: the API refuses them, and they never see billing. */
export const useBilling = (waitingForCheckout = false, enabled = true) => useQuery({ ...billingQueryOptions(waitingForCheckout), enabled });
