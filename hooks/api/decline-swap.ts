import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SwapDto } from '@/shared/api/swaps';
import { apiFetch } from './api-client';
import { invalidateSwaps } from './invalidate-swaps';

export const declineSwap = ({ id, version }: { id: number; version: number }) => apiFetch<SwapDto>(`/me/swaps/${id}/decline`, { method: 'POST', body: { version } });

export function useDeclineSwap() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: declineSwap, onSuccess: () => invalidateSwaps(queryClient) });
}
