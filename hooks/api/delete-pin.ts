import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const deletePin = ({ rosterId, seatId }: { rosterId: number; seatId: number }) => apiFetch<void>(`/rosters/${rosterId}/pins/${seatId}`, { method: 'DELETE' });

export function useDeletePin() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deletePin,
    onSuccess: (_d, v) => Promise.all([queryClient.invalidateQueries({ queryKey: keys.rosters.detail(v.rosterId).queryKey }), queryClient.invalidateQueries({ queryKey: keys.runs._def })]),
  });
}
