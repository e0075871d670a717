import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CopyForwardInput, CopyForwardResult } from '@/shared/api/copy-forward';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export type { CopyForwardResult };

/** A new roster from an earlier one, its period moved (server/rosters/copy-forward.ts). */
export const copyForward = ({ rosterId, ...body }: CopyForwardInput & { rosterId: number }) => apiFetch<CopyForwardResult>(`/rosters/${rosterId}/copy-forward`, { method: 'POST', body });

export function useCopyForward() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: copyForward, onSuccess: () => queryClient.invalidateQueries({ queryKey: keys.rosters.list.queryKey }) });
}
