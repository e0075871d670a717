import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SwapDto, SwapProposal } from '@/shared/api/swaps';
import { apiFetch } from './api-client';
import { invalidateSwaps } from './invalidate-swaps';

export const proposeSwap = (body: SwapProposal) => apiFetch<SwapDto>('/me/swaps', { method: 'POST', body });

export function useProposeSwap() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: proposeSwap, onSuccess: () => invalidateSwaps(queryClient) });
}
