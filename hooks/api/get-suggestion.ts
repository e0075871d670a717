import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { SuggestionAnswer } from '@/shared/api/suggestion';
import { keys } from './query-keys';

export const getSuggestion = (rosterId: number) => apiFetch<SuggestionAnswer>(`/rosters/${rosterId}/suggestion`);

export const suggestionQueryOptions = (rosterId: number) => queryOptions({ queryKey: keys.rosters.detail(rosterId)._ctx.suggestion.queryKey, queryFn: () => getSuggestion(rosterId) });

export const useSuggestion = (rosterId: number) => useQuery(suggestionQueryOptions(rosterId));
