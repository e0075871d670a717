import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SwapDto } from '@/shared/api/swaps';
import { apiFetch } from './api-client';
import { invalidateSwaps } from './invalidate-swaps';

export interface ChangeMail { sent: number; noAddress: string[]; failed: number }

/** The coordinator's one tap: approve changes the published roster and mails both people. */
export const decideSwap = ({ id, ...body }: { id: number; decision: 'approve' | 'refuse'; version: number }) =>
  apiFetch<{ swap: SwapDto; mail: ChangeMail | null }>(`/swaps/${id}/decision`, { method: 'POST', body });

export function useDecideSwap() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: decideSwap, onSuccess: () => invalidateSwaps(queryClient) });
}
