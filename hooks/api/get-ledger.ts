import { queryOptions, useQuery } from '@tanstack/react-query';
import type { LedgerAnswer } from '@/shared/api/ledger';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** Per-person counts across published rosters (coordinators). */
export const getLedger = (range: { from?: string; to?: string } = {}) => {
  const q = new URLSearchParams(Object.entries(range).filter(([, v]) => v) as Array<[string, string]>).toString();
  return apiFetch<LedgerAnswer>(`/ledger${q ? `?${q}` : ''}`);
};

export const ledgerQueryOptions = (range: { from?: string; to?: string } = {}) => queryOptions({ queryKey: keys.ledger.range(range.from ?? '', range.to ?? '').queryKey, queryFn: () => getLedger(range) });

export const useLedger = (range: { from?: string; to?: string } = {}) => useQuery(ledgerQueryOptions(range));
