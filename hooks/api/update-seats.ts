import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SeatsInput } from '@/shared/billing/api';
import { apiFetch } from './api-client';
import { billingQueryOptions } from './get-billing';
import { invoicesQueryOptions } from './get-invoices';

export const updateSeats = (input: SeatsInput) => apiFetch<{ quantity: number; changed: boolean }>('/billing/seats', { method: 'POST', body: input });

export function useUpdateSeats() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateSeats,
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: billingQueryOptions().queryKey });
      void queryClient.invalidateQueries({ queryKey: invoicesQueryOptions().queryKey });
    },
  });
}
