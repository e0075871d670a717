import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { OfferDto } from '@/shared/api/swaps';
import { apiFetch } from './api-client';
import type { ChangeMail } from './decide-swap';
import { invalidateSwaps } from './invalidate-swaps';

export const decideOffer = ({ id, ...body }: { id: number; decision: 'approve' | 'refuse'; version: number }) =>
  apiFetch<{ offer: OfferDto; mail: ChangeMail | null }>(`/offers/${id}/decision`, { method: 'POST', body });

export function useDecideOffer() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: decideOffer, onSuccess: () => invalidateSwaps(queryClient) });
}
