import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { PublishResult } from './roster-types';
import { keys } from './query-keys';

export const publishRoster = ({ rosterId, runId, version }: { rosterId: number; runId: number; version: number }) =>
  apiFetch<PublishResult>(`/rosters/${rosterId}/publish`, { method: 'POST', body: { runId, version } });

export function usePublishRoster() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: publishRoster, onSuccess: () => queryClient.invalidateQueries({ queryKey: keys.rosters._def }) });
}
