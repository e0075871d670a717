import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { PatternDto } from './roster-types';

export const getPatterns = (rosterId: number) => apiFetch<{ items: PatternDto[] }>(`/rosters/${rosterId}/patterns`).then((r) => r.items);

export const patternsQueryOptions = (rosterId: number) => queryOptions({ queryKey: ['rosters', rosterId, 'patterns'], queryFn: () => getPatterns(rosterId) });

export const usePatterns = (rosterId: number) => useQuery(patternsQueryOptions(rosterId));
