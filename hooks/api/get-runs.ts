import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { RunDto } from './roster-types';

export const getRuns = (rosterId: number) => apiFetch<{ items: RunDto[] }>(`/rosters/${rosterId}/runs`).then((r) => r.items);

export const runsQueryOptions = (rosterId: number) => queryOptions({ queryKey: ['rosters', rosterId, 'runs'], queryFn: () => getRuns(rosterId) });

export const useRuns = (rosterId: number) => useQuery(runsQueryOptions(rosterId));
