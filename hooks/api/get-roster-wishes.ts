import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CoordinatorWishDto, WishesViewDto } from '@/shared/api/rosters';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** Older servers answer items only; who entered a wish, when, and the silent list may be missing. */
export type RosterWish = Omit<CoordinatorWishDto, 'enteredByName' | 'createdAt' | 'updatedAt'> & Partial<Pick<CoordinatorWishDto, 'enteredByName' | 'createdAt' | 'updatedAt'>>;
export interface RosterWishes {
  items: RosterWish[];
  silent?: WishesViewDto['silent'];
}

export const getRosterWishes = (rosterId: number) => apiFetch<RosterWishes>(`/rosters/${rosterId}/wishes`);

export const rosterWishesQueryOptions = (rosterId: number) => queryOptions({ queryKey: keys.rosters.detail(rosterId)._ctx.wishes.queryKey, queryFn: () => getRosterWishes(rosterId) });

export const useRosterWishes = (rosterId: number) => useQuery(rosterWishesQueryOptions(rosterId));
