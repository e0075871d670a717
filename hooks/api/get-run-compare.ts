import { queryOptions, useQuery } from '@tanstack/react-query';
import type { RunCompare } from '@/shared/api/compare';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const getRunCompare = (rosterId: number, a: number, b: number) => apiFetch<RunCompare>(`/rosters/${rosterId}/compare?a=${a}&b=${b}`);

export const runCompareQueryOptions = (rosterId: number, a: number, b: number) => queryOptions({ queryKey: keys.rosters.detail(rosterId)._ctx.compare(a, b).queryKey, queryFn: () => getRunCompare(rosterId, a, b) });

export const useRunCompare = (rosterId: number | null, a: number | null, b: number | null) =>
  useQuery({ ...runCompareQueryOptions(rosterId ?? 0, a ?? 0, b ?? 0), enabled: rosterId !== null && a !== null && b !== null && a !== b });
