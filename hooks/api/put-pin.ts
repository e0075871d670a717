import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { PinDto } from './get-pins';
import { keys } from './query-keys';

/** Fixes a seat to a person (or open); later runs keep it. Bumps the roster version. */
export const putPin = ({ rosterId, seatId, personId }: { rosterId: number } & PinDto) =>
  apiFetch<PinDto>(`/rosters/${rosterId}/pins`, { method: 'PUT', body: { seatId, personId } });

export function usePutPin() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: putPin,
    onSuccess: (_d, v) => Promise.all([queryClient.invalidateQueries({ queryKey: keys.rosters.detail(v.rosterId).queryKey }), queryClient.invalidateQueries({ queryKey: keys.runs._def })]),
  });
}
