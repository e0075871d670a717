import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { invalidateAbsences } from './invalidate-absences';

export const deleteAbsence = (id: number) => apiFetch<void>(`/absences/${id}`, { method: 'DELETE' });

export function useDeleteAbsence() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: deleteAbsence, onSuccess: () => invalidateAbsences(queryClient) });
}
