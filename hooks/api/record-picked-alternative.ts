import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { PickedAlternativeAnswer } from '@/shared/api/suggestion';
import { keys } from './query-keys';

/** Records a seat alternative the coordinator picked as one of their edits (the weight suggestion learns from it). */
export const recordPickedAlternative = ({ rosterId, ...pick }: { rosterId: number; runId: number; seatId: number; personId: number | null }) =>
  apiFetch<PickedAlternativeAnswer>(`/rosters/${rosterId}/preferences/alternative`, { method: 'POST', body: pick });

export function useRecordPickedAlternative() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: recordPickedAlternative, onSuccess: (_d, v) => queryClient.invalidateQueries({ queryKey: keys.rosters.detail(v.rosterId)._ctx.suggestion.queryKey }) });
}
