import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { updateShiftBody } from '@/shared/api/rosters';
import { apiFetch } from './api-client';
import type { ShiftDto } from './roster-types';
import { keys } from './query-keys';

export const updateShift = ({ rosterId, shiftId, changes }: { rosterId: number; shiftId: number; changes: z.input<typeof updateShiftBody> }) =>
  apiFetch<ShiftDto>(`/rosters/${rosterId}/shifts/${shiftId}`, { method: 'PATCH', body: changes });

export function useUpdateShift() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: updateShift, onSuccess: (_d, v) => queryClient.invalidateQueries({ queryKey: keys.rosters.detail(v.rosterId).queryKey }) });
}
