import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const saveManualRun = ({ rosterId, ...body }: { rosterId: number; assignment: Record<string, number | null>; version: number; basedOnRunId?: number | null }) =>
  apiFetch<{ runId: number; score: number | null; version: number }>(`/rosters/${rosterId}/manual-runs`, { method: 'POST', body });

export function useSaveManualRun() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: saveManualRun, onSuccess: (_d, v) => queryClient.invalidateQueries({ queryKey: keys.rosters.detail(v.rosterId).queryKey }) });
}
