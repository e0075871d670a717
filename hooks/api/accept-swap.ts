import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SwapDto } from '@/shared/api/swaps';
import { apiFetch } from './api-client';
import { invalidateSwaps } from './invalidate-swaps';

export const acceptSwap = ({ id, version }: { id: number; version: number }) => apiFetch<SwapDto>(`/me/swaps/${id}/accept`, { method: 'POST', body: { version } });

export function useAcceptSwap() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: acceptSwap, onSuccess: () => invalidateSwaps(queryClient) });
}
