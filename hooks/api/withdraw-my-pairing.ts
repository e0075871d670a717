import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const withdrawMyPairing = (id: number) => apiFetch<void>(`/me/pairings/${id}`, { method: 'DELETE' });

export function useWithdrawMyPairing() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: withdrawMyPairing,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: keys.me.pairings.queryKey }),
  });
}
