import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SwapDto } from '@/shared/api/swaps';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** Every swap of the workspace, newest first (coordinators). */
export const getSwaps = () => apiFetch<{ items: SwapDto[] }>('/swaps').then((r) => r.items);

export const swapsQueryOptions = () => queryOptions({ queryKey: keys.swaps.list.queryKey, queryFn: getSwaps });

export const useSwaps = () => useQuery(swapsQueryOptions());
