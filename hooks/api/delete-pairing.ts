import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const deletePairing = (id: number) => apiFetch<void>(`/pairings/${id}`, { method: 'DELETE' });

export function useDeletePairing() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: deletePairing, onSuccess: () => queryClient.invalidateQueries({ queryKey: keys.pairings._def }) });
}
