import { queryOptions, useQuery } from '@tanstack/react-query';
import type { RunCompare } from '@/shared/api/compare';
import { apiFetch } from './api-client';

export const getRunCompare = (rosterId: number, a: number, b: number) => apiFetch<RunCompare>(`/rosters/${rosterId}/compare?a=${a}&b=${b}`);

export const runCompareQueryOptions = (rosterId: number, a: number, b: number) => queryOptions({ queryKey: ['rosters', rosterId, 'compare', a, b], queryFn: () => getRunCompare(rosterId, a, b) });

export const useRunCompare = (rosterId: number | null, a: number | null, b: number | null) =>
  useQuery({ ...runCompareQueryOptions(rosterId ?? 0, a ?? 0, b ?? 0), enabled: rosterId !== null && a !== null && b !== null && a !== b });
