import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { OfferDto } from '@/shared/api/swaps';
import { apiFetch } from './api-client';
import { invalidateSwaps } from './invalidate-swaps';

export const createOffer = ({ rosterId, ...body }: { rosterId: number; seatId: number; personIds?: number[] }) =>
  apiFetch<OfferDto>(`/rosters/${rosterId}/offers`, { method: 'POST', body });

export function useCreateOffer() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createOffer, onSuccess: () => invalidateSwaps(queryClient) });
}
