import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PersonDto } from '@/shared/api/people';
import { apiFetch } from './api-client';

export const getPerson = (id: number) => apiFetch<PersonDto>(`/people/${id}`);

export const personQueryOptions = (id: number) => queryOptions({ queryKey: ['people', 'one', id], queryFn: () => getPerson(id) });

export const usePerson = (id: number) => useQuery({ ...personQueryOptions(id), enabled: Number.isInteger(id) && id > 0 });
