import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export interface PinDto {
  seatId: number;
  personId: number | null;
}

export const getPins = (rosterId: number) => apiFetch<{ items: PinDto[] }>(`/rosters/${rosterId}/pins`).then((r) => r.items);

export const pinsQueryOptions = (rosterId: number) => queryOptions({ queryKey: keys.rosters.detail(rosterId)._ctx.pins.queryKey, queryFn: () => getPins(rosterId) });

export const usePins = (rosterId: number) => useQuery(pinsQueryOptions(rosterId));
