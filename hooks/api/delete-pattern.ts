import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const deletePattern = ({ rosterId, patternId }: { rosterId: number; patternId: number }) =>
  apiFetch<void>(`/rosters/${rosterId}/patterns/${patternId}`, { method: 'DELETE' });

export function useDeletePattern() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: deletePattern, onSuccess: (_d, v) => queryClient.invalidateQueries({ queryKey: keys.rosters.detail(v.rosterId).queryKey }) });
}
