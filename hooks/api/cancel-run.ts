import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { RunDto } from './roster-types';
import { keys } from './query-keys';

export const cancelRun = (runId: number) => apiFetch<RunDto>(`/runs/${runId}/cancel`, { method: 'POST', body: {} });

export function useCancelRun() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: cancelRun, onSuccess: (_d, runId) => queryClient.invalidateQueries({ queryKey: keys.runs.detail(runId).queryKey }) });
}
