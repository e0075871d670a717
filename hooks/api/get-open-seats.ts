import { queryOptions, useQuery } from '@tanstack/react-query';
import type { OpenSeatDto } from '@/shared/api/swaps';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** A published roster's uncovered seats with who is eligible for each. */
export const getOpenSeats = (rosterId: number) => apiFetch<{ items: OpenSeatDto[] }>(`/rosters/${rosterId}/open-seats`).then((r) => r.items);

export const openSeatsQueryOptions = (rosterId: number) => queryOptions({ queryKey: keys.offers.openSeats(rosterId).queryKey, queryFn: () => getOpenSeats(rosterId) });

export const useOpenSeats = (rosterId: number | null) => useQuery({ ...openSeatsQueryOptions(rosterId ?? 0), enabled: rosterId !== null });
