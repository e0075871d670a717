import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MyLedgerAnswer } from '@/shared/api/ledger';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** The signed-in person's own ledger beside the team's averages (whole published rosters meeting the range). */
export const getMyLedger = (range: { from?: string; to?: string } = {}) => {
  const q = new URLSearchParams(Object.entries(range).filter(([, v]) => v) as Array<[string, string]>).toString();
  return apiFetch<MyLedgerAnswer>(`/me/ledger${q ? `?${q}` : ''}`);
};

// Under keys.me, so an approved swap or a taken offer (invalidateSwaps) refreshes it.
export const myLedgerQueryOptions = (range: { from?: string; to?: string } = {}) =>
  queryOptions({ queryKey: keys.me.ledger(range.from ?? '', range.to ?? '').queryKey, queryFn: () => getMyLedger(range) });

export const useMyLedger = (range: { from?: string; to?: string } = {}) => useQuery(myLedgerQueryOptions(range));
