import { queryOptions, useQuery } from '@tanstack/react-query';
import type { OpenSeatDto } from '@/shared/api/swaps';
import { apiFetch } from './api-client';

/** A published roster's uncovered seats with who is eligible for each. */
export const getOpenSeats = (rosterId: number) => apiFetch<{ items: OpenSeatDto[] }>(`/rosters/${rosterId}/open-seats`).then((r) => r.items);

export const openSeatsQueryOptions = (rosterId: number) => queryOptions({ queryKey: ['offers', 'open-seats', rosterId], queryFn: () => getOpenSeats(rosterId) });

export const useOpenSeats = (rosterId: number | null) => useQuery({ ...openSeatsQueryOptions(rosterId ?? 0), enabled: rosterId !== null });
