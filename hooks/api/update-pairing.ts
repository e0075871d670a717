import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { PairingDto } from '@/shared/api/pairings';
import type { updatePairingBody } from '@/shared/api/rosters';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** Score, never-together or status (approve / decline a request), with the version the screen showed. */
export const updatePairing = ({ id, ...input }: z.input<typeof updatePairingBody> & { id: number }) => apiFetch<PairingDto>(`/pairings/${id}`, { method: 'PATCH', body: input });

export function useUpdatePairing() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: updatePairing, onSettled: () => queryClient.invalidateQueries({ queryKey: keys.pairings._def }) });
}
