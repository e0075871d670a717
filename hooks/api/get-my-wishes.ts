import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MyWishesAnswer } from '@/shared/api/staff';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** The signed-in person's own wishes for one roster, with its period, deadline and cannot limit. */
export const getMyWishes = (rosterId: number) => apiFetch<MyWishesAnswer>(`/me/rosters/${rosterId}/wishes`);

export const myWishesQueryOptions = (rosterId: number) => queryOptions({ queryKey: keys.me.wishes(rosterId).queryKey, queryFn: () => getMyWishes(rosterId) });

export const useMyWishes = (rosterId: number | null) => useQuery({ ...myWishesQueryOptions(rosterId ?? 0), enabled: rosterId !== null });
