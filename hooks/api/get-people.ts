import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Page } from '@/shared/api/paging';
import type { PeopleListQuery, PersonDto } from '@/shared/api/people';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export type { PersonDto };

export function getPeople(query: PeopleListQuery = {}) {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(query)) if (v !== undefined && v !== '' && v !== null) params.set(k, String(v));
  const qs = params.toString();
  return apiFetch<Page<PersonDto>>(`/people${qs ? `?${qs}` : ''}`);
}

/** Every people list shares the ['people'] prefix, so one invalidation refreshes them all. */
export const peopleQueryOptions = (query: PeopleListQuery = {}) =>
  queryOptions({ queryKey: keys.people.list(query).queryKey, queryFn: () => getPeople(query), placeholderData: keepPreviousData });

export const usePeople = (query: PeopleListQuery = {}) => useQuery(peopleQueryOptions(query));
