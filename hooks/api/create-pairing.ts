import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { PairingDto } from '@/shared/api/pairings';
import type { pairingBody } from '@/shared/api/rosters';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const createPairing = (input: z.input<typeof pairingBody>) => apiFetch<PairingDto>('/pairings', { method: 'POST', body: input });

export function useCreatePairing() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createPairing, onSuccess: () => queryClient.invalidateQueries({ queryKey: keys.pairings._def }) });
}
