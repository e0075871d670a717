import { queryOptions, useQuery } from '@tanstack/react-query';
import type { OfferDto } from '@/shared/api/swaps';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** Open shifts offered to me, and the ones I took. */
export const getMyOffers = () => apiFetch<{ items: OfferDto[] }>('/me/offers').then((r) => r.items);

export const myOffersQueryOptions = () => queryOptions({ queryKey: keys.me.offers.queryKey, queryFn: getMyOffers });

export const useMyOffers = () => useQuery(myOffersQueryOptions());
