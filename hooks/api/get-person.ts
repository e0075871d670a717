import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PersonDto } from '@/shared/api/people';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const getPerson = (id: number) => apiFetch<PersonDto>(`/people/${id}`);

export const personQueryOptions = (id: number) => queryOptions({ queryKey: keys.people.detail(id).queryKey, queryFn: () => getPerson(id) });

export const usePerson = (id: number) => useQuery({ ...personQueryOptions(id), enabled: Number.isInteger(id) && id > 0 });
