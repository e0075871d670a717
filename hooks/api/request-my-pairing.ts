import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MyPairingRequest, PairingRequestInput } from '@/shared/api/staff';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const requestMyPairing = (body: PairingRequestInput) => apiFetch<MyPairingRequest>('/me/pairings', { method: 'POST', body });

export function useRequestMyPairing() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: requestMyPairing,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: keys.me.pairings.queryKey }),
  });
}
