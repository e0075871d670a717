import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { RosterDto } from './roster-types';
import { keys } from './query-keys';

export const getRoster = (id: number) => apiFetch<RosterDto>(`/rosters/${id}`);

export const rosterQueryOptions = (id: number) => queryOptions({ queryKey: keys.rosters.detail(id).queryKey, queryFn: () => getRoster(id) });

export const useRoster = (id: number) => useQuery(rosterQueryOptions(id));
