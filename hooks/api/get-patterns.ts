import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { PatternDto } from './roster-types';
import { keys } from './query-keys';

export const getPatterns = (rosterId: number) => apiFetch<{ items: PatternDto[] }>(`/rosters/${rosterId}/patterns`).then((r) => r.items);

export const patternsQueryOptions = (rosterId: number) => queryOptions({ queryKey: keys.rosters.detail(rosterId)._ctx.patterns.queryKey, queryFn: () => getPatterns(rosterId) });

export const usePatterns = (rosterId: number) => useQuery(patternsQueryOptions(rosterId));
