import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SwapDto } from '@/shared/api/swaps';
import { apiFetch } from './api-client';

/** Swaps I proposed or was asked to accept. */
export const getMySwaps = () => apiFetch<{ items: SwapDto[] }>('/me/swaps').then((r) => r.items);

export const mySwapsQueryOptions = () => queryOptions({ queryKey: ['me', 'swaps'], queryFn: getMySwaps });

export const useMySwaps = () => useQuery(mySwapsQueryOptions());
