import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { SuggestionDto } from '@/shared/api/suggestion';
import { keys } from './query-keys';

/** Learns a suggestion from the workspace's edits (the server answers when it is done, within its time limit). */
export const createSuggestion = ({ rosterId }: { rosterId: number }) => apiFetch<{ suggestion: SuggestionDto }>(`/rosters/${rosterId}/suggestion`, { method: 'POST', body: {} });

export function useCreateSuggestion() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createSuggestion, onSuccess: (_d, v) => queryClient.invalidateQueries({ queryKey: keys.rosters.detail(v.rosterId)._ctx.suggestion.queryKey }) });
}
