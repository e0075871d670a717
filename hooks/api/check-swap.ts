import { useMutation } from '@tanstack/react-query';
import type { ChangeCheck, SwapProposal } from '@/shared/api/swaps';
import { apiFetch } from './api-client';

/** Scores the roster with the swap made, storing nothing: the screen shows why before anyone is asked. */
export const checkSwap = (body: SwapProposal) => apiFetch<ChangeCheck>('/me/swaps/check', { method: 'POST', body });

export const useCheckSwap = () => useMutation({ mutationFn: checkSwap });
