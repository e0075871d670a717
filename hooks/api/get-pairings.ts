import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { PairingDto, PairingStatus } from '@/shared/api/pairings';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export type { PairingDto, PairingStatus };

export function getPairings(filter: { status?: PairingStatus; q?: string } = {}) {
  const params = new URLSearchParams();
  if (filter.status) params.set('status', filter.status);
  if (filter.q?.trim()) params.set('q', filter.q.trim());
  const qs = params.toString();
  return apiFetch<{ items: PairingDto[] }>(`/pairings${qs ? `?${qs}` : ''}`).then((r) => r.items);
}

export const pairingsQueryOptions = (filter: { status?: PairingStatus; q?: string } = {}) =>
  queryOptions({ queryKey: keys.pairings.list(filter).queryKey, queryFn: () => getPairings(filter), placeholderData: keepPreviousData });

export const usePairings = (filter: { status?: PairingStatus; q?: string } = {}) => useQuery(pairingsQueryOptions(filter));
