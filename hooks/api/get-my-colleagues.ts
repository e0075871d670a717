import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** Colleagues in the workspace, names only, to ask to work with or apart from. */
export const getMyColleagues = () => apiFetch<{ items: Array<{ id: number; name: string }> }>('/me/colleagues').then((r) => r.items);

export const myColleaguesQueryOptions = () => queryOptions({ queryKey: keys.me.colleagues.queryKey, queryFn: getMyColleagues, staleTime: 5 * 60_000 });

export const useMyColleagues = () => useQuery(myColleaguesQueryOptions());
