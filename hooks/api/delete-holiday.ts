import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const deleteHoliday = (id: number) => apiFetch<void>(`/ledger/holidays/${id}`, { method: 'DELETE' });

export function useDeleteHoliday() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: deleteHoliday, onSuccess: () => queryClient.invalidateQueries({ queryKey: keys.ledger._def }) });
}
