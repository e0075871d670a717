import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { SuggestionDto } from '@/shared/api/suggestion';
import { keys } from './query-keys';

/** Adopt (the roster's rules change) or dismiss a suggestion. */
export const decideSuggestion = ({ rosterId, suggestionId, decision }: { rosterId: number; suggestionId: number; decision: 'adopt' | 'dismiss' }) =>
  apiFetch<{ suggestion: SuggestionDto }>(`/rosters/${rosterId}/suggestion/${decision}`, { method: 'POST', body: { suggestionId } });

export function useDecideSuggestion() {
  const queryClient = useQueryClient();
  // adopting changes the rules and the roster's version, so everything of the roster is read again
  return useMutation({ mutationFn: decideSuggestion, onSuccess: (_d, v) => queryClient.invalidateQueries({ queryKey: keys.rosters.detail(v.rosterId).queryKey }) });
}
