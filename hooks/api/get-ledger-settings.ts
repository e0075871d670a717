import { queryOptions, useQuery } from '@tanstack/react-query';
import type { LedgerSettingsDto } from '@/shared/api/ledger';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const getLedgerSettings = () => apiFetch<LedgerSettingsDto>('/ledger/settings');

export const ledgerSettingsQueryOptions = () => queryOptions({ queryKey: keys.ledger.settings.queryKey, queryFn: getLedgerSettings });

export const useLedgerSettings = () => useQuery(ledgerSettingsQueryOptions());
