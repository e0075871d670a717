import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** Only while it is still a request; a decided absence goes through the coordinator. */
export const withdrawMyAbsence = (id: number) => apiFetch<void>(`/me/absences/${id}`, { method: 'DELETE' });

export function useWithdrawMyAbsence() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: withdrawMyAbsence, onSuccess: () => queryClient.invalidateQueries({ queryKey: keys.me.absences.queryKey }) });
}
