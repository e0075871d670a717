import { queryOptions, useQuery } from '@tanstack/react-query';
import type { OfferDto } from '@/shared/api/swaps';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const getRosterOffers = (rosterId: number) => apiFetch<{ items: OfferDto[] }>(`/rosters/${rosterId}/offers`).then((r) => r.items);

export const rosterOffersQueryOptions = (rosterId: number) => queryOptions({ queryKey: keys.offers.roster(rosterId).queryKey, queryFn: () => getRosterOffers(rosterId) });

export const useRosterOffers = (rosterId: number | null) => useQuery({ ...rosterOffersQueryOptions(rosterId ?? 0), enabled: rosterId !== null });
