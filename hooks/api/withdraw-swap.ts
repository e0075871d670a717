import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SwapDto } from '@/shared/api/swaps';
import { apiFetch } from './api-client';
import { invalidateSwaps } from './invalidate-swaps';

export const withdrawSwap = ({ id, version }: { id: number; version: number }) => apiFetch<SwapDto>(`/me/swaps/${id}/withdraw`, { method: 'POST', body: { version } });

export function useWithdrawSwap() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: withdrawSwap, onSuccess: () => invalidateSwaps(queryClient) });
}
