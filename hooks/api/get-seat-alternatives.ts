import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { SeatAlternatives } from './roster-types';
import { keys } from './query-keys';

export const getSeatAlternatives = (runId: number, seatId: number) => apiFetch<SeatAlternatives>(`/runs/${runId}/seats/${seatId}/alternatives`);

export const seatAlternativesQueryOptions = (runId: number, seatId: number) =>
  queryOptions({ queryKey: keys.runs.detail(runId)._ctx.seatAlternatives(seatId).queryKey, queryFn: () => getSeatAlternatives(runId, seatId) });

export const useSeatAlternatives = (runId: number, seatId: number) => useQuery(seatAlternativesQueryOptions(runId, seatId));
