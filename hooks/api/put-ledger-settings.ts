import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { LedgerSettingsDto, ledgerSettingsBody } from '@/shared/api/ledger';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const putLedgerSettings = (body: z.input<typeof ledgerSettingsBody>) => apiFetch<LedgerSettingsDto>('/ledger/settings', { method: 'PUT', body });

/** Holidays and weights change what the ledger counts and what the next roster reads. */
export function usePutLedgerSettings() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: putLedgerSettings, onSuccess: () => queryClient.invalidateQueries({ queryKey: keys.ledger._def }) });
}
