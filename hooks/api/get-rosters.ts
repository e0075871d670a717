import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Page } from '@/shared/api/paging';
import { apiFetch } from './api-client';
import type { RosterDto } from './roster-types';
import { keys } from './query-keys';

export const getRosters = () => apiFetch<Page<RosterDto>>('/rosters?pageSize=200&sort=periodStart&order=desc');

/** Every roster read shares the keys.rosters prefix, so one invalidation refreshes them all. */
export const rostersQueryOptions = () => queryOptions({ queryKey: keys.rosters.list.queryKey, queryFn: getRosters });

export const useRosters = () => useQuery(rostersQueryOptions());
