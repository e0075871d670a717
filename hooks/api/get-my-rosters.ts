import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MyRoster } from '@/shared/api/staff';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** Rosters the signed-in person can state wishes for (and published ones), current and future. */
export const getMyRosters = () => apiFetch<{ items: MyRoster[] }>('/me/rosters').then((r) => r.items);

export const myRostersQueryOptions = () => queryOptions({ queryKey: keys.me.rosters.queryKey, queryFn: getMyRosters });

export const useMyRosters = () => useQuery(myRostersQueryOptions());
