import { queryOptions, useQuery } from '@tanstack/react-query';
import type { LedgerSettingsDto } from '@/shared/api/ledger';
import { apiFetch } from './api-client';

export const getLedgerSettings = () => apiFetch<LedgerSettingsDto>('/ledger/settings');

export const ledgerSettingsQueryOptions = () => queryOptions({ queryKey: ['ledger', 'settings'], queryFn: getLedgerSettings });

export const useLedgerSettings = () => useQuery(ledgerSettingsQueryOptions());
