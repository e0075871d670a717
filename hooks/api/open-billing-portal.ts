import { useMutation } from '@tanstack/react-query';
import { apiFetch } from './api-client';

/** A short-lived link to the payment service's page for cards and the subscription. */
export const openBillingPortal = () => apiFetch<{ url: string }>('/billing/portal', { method: 'POST' });

export const useOpenBillingPortal = () => useMutation({ mutationFn: openBillingPortal });
