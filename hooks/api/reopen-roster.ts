import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { RosterDto } from './roster-types';
import { keys } from './query-keys';

export const reopenRoster = ({ rosterId, version }: { rosterId: number; version: number }) => apiFetch<RosterDto>(`/rosters/${rosterId}/reopen`, { method: 'POST', body: { version } });

export function useReopenRoster() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: reopenRoster, onSuccess: () => queryClient.invalidateQueries({ queryKey: keys.rosters._def }) });
}
