import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { OfferDto } from '@/shared/api/swaps';
import { apiFetch } from './api-client';
import { invalidateSwaps } from './invalidate-swaps';

/** First eligible taker wins; a later one gets a 409 in words. */
export const takeOffer = (id: number) => apiFetch<OfferDto>(`/me/offers/${id}/take`, { method: 'POST' });

export function useTakeOffer() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: takeOffer, onSuccess: () => invalidateSwaps(queryClient) });
}
