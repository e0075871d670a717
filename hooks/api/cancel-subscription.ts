import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** atPeriodEnd true: the plan ends with the paid period; false: keep it after all. */
export const cancelSubscription = (input: { atPeriodEnd: boolean }) =>
  apiFetch<{ cancelAtPeriodEnd: boolean; currentPeriodEnd: string | null }>('/billing/cancel', { method: 'POST', body: input });

export function useCancelSubscription() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: cancelSubscription,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: keys.billing._def }),
  });
}
