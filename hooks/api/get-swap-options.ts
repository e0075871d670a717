import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SwapOptions } from '@/shared/api/swaps';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** My future published shifts and colleagues' shifts on the same rosters. */
export const getSwapOptions = () => apiFetch<SwapOptions>('/me/swap-options');

export const swapOptionsQueryOptions = () => queryOptions({ queryKey: keys.me.swapOptions.queryKey, queryFn: getSwapOptions });

export const useSwapOptions = () => useQuery(swapOptionsQueryOptions());
