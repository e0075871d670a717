import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { ShiftDto } from './roster-types';
import { keys } from './query-keys';

export const getShifts = (rosterId: number) => apiFetch<{ items: ShiftDto[] }>(`/rosters/${rosterId}/shifts`).then((r) => r.items);

export const shiftsQueryOptions = (rosterId: number) => queryOptions({ queryKey: keys.rosters.detail(rosterId)._ctx.shifts.queryKey, queryFn: () => getShifts(rosterId) });

export const useShifts = (rosterId: number) => useQuery(shiftsQueryOptions(rosterId));
