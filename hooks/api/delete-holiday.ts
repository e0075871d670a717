import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';

export const deleteHoliday = (id: number) => apiFetch<void>(`/ledger/holidays/${id}`, { method: 'DELETE' });

export function useDeleteHoliday() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: deleteHoliday, onSuccess: () => queryClient.invalidateQueries({ queryKey: ['ledger'] }) });
}
