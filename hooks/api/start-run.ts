import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { RunDto } from './roster-types';
import { keys } from './query-keys';

export const startRun = ({ rosterId, timeLimitSeconds, seed }: { rosterId: number; timeLimitSeconds: number; seed?: number }) =>
  apiFetch<RunDto>(`/rosters/${rosterId}/runs`, { method: 'POST', body: { timeLimitSeconds, ...(seed === undefined ? {} : { seed }) } });

export function useStartRun() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: startRun, onSuccess: (_d, v) => queryClient.invalidateQueries({ queryKey: keys.rosters.detail(v.rosterId)._ctx.runs.queryKey }) });
}
