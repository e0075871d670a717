import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';

export const deletePairing = (id: number) => apiFetch<void>(`/pairings/${id}`, { method: 'DELETE' });

export function useDeletePairing() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: deletePairing, onSuccess: () => queryClient.invalidateQueries({ queryKey: ['pairings'] }) });
}
