import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { LedgerSettingsDto } from '@/shared/api/ledger';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const addHoliday = (body: { date: string; name: string }) => apiFetch<LedgerSettingsDto>('/ledger/holidays', { method: 'POST', body });

export function useAddHoliday() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: addHoliday, onSuccess: () => queryClient.invalidateQueries({ queryKey: keys.ledger._def }) });
}
