import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { myAbsencesQueryOptions } from './get-my-absences';

/** Only while it is still a request; a decided absence goes through the coordinator. */
export const withdrawMyAbsence = (id: number) => apiFetch<void>(`/me/absences/${id}`, { method: 'DELETE' });

export function useWithdrawMyAbsence() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: withdrawMyAbsence, onSuccess: () => queryClient.invalidateQueries({ queryKey: myAbsencesQueryOptions().queryKey }) });
}
