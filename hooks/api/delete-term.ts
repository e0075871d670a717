import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const deleteTerm = ({ personId, termId }: { personId: number; termId: number }) => apiFetch<void>(`/people/${personId}/terms/${termId}`, { method: 'DELETE' });

export function useDeleteTerm() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: deleteTerm, onSuccess: (_d, v) => queryClient.invalidateQueries({ queryKey: keys.people.detail(v.personId)._ctx.terms.queryKey }) });
}
