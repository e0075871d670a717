import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SeatsInput } from '@/shared/billing/api';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const updateSeats = (input: SeatsInput) => apiFetch<{ quantity: number; changed: boolean }>('/billing/seats', { method: 'POST', body: input });

export function useUpdateSeats() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateSeats,
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: keys.billing._def });
      void queryClient.invalidateQueries({ queryKey: keys.billing.invoices.queryKey });
    },
  });
}
