import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** Starts (or resumes) the team plan checkout; the caller sends the browser to the returned page. */
export const startCheckout = () => apiFetch<{ url: string; reused: boolean }>('/billing/checkout', { method: 'POST' });

export function useStartCheckout() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: startCheckout,
    onSettled: () => queryClient.invalidateQueries({ queryKey: keys.billing._def }),
  });
}
