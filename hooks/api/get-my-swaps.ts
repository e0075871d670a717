import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SwapDto } from '@/shared/api/swaps';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** Swaps I proposed or was asked to accept. */
export const getMySwaps = () => apiFetch<{ items: SwapDto[] }>('/me/swaps').then((r) => r.items);

export const mySwapsQueryOptions = () => queryOptions({ queryKey: keys.me.swaps.queryKey, queryFn: getMySwaps });

export const useMySwaps = () => useQuery(mySwapsQueryOptions());
