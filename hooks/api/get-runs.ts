import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { RunDto } from './roster-types';
import { keys } from './query-keys';

export const getRuns = (rosterId: number) => apiFetch<{ items: RunDto[] }>(`/rosters/${rosterId}/runs`).then((r) => r.items);

export const runsQueryOptions = (rosterId: number) => queryOptions({ queryKey: keys.rosters.detail(rosterId)._ctx.runs.queryKey, queryFn: () => getRuns(rosterId) });

export const useRuns = (rosterId: number) => useQuery(runsQueryOptions(rosterId));
