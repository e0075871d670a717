import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** A re-solve that keeps every seat but the uncovered ones pinned (202 with the queued run). */
export const startAbsenceCover = (rosterId: number) => apiFetch<{ runId: number }>(`/rosters/${rosterId}/absence-cover`, { method: 'POST', body: {} });

export function useStartAbsenceCover() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: startAbsenceCover, onSuccess: (_d, rosterId) => queryClient.invalidateQueries({ queryKey: keys.rosters.detail(rosterId)._ctx.runs.queryKey }) });
}
