import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { runsQueryOptions } from './get-runs';
import type { RunDto } from './roster-types';

export const startRun = ({ rosterId, timeLimitSeconds, seed }: { rosterId: number; timeLimitSeconds: number; seed?: number }) =>
  apiFetch<RunDto>(`/rosters/${rosterId}/runs`, { method: 'POST', body: { timeLimitSeconds, ...(seed === undefined ? {} : { seed }) } });

export function useStartRun() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: startRun, onSuccess: (_d, v) => queryClient.invalidateQueries({ queryKey: runsQueryOptions(v.rosterId).queryKey }) });
}
