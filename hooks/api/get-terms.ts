import { queryOptions, useQuery } from '@tanstack/react-query';
import type { TermDto } from '@/shared/api/terms';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export type { TermDto };

export const getTerms = (personId: number) => apiFetch<{ items: TermDto[] }>(`/people/${personId}/terms`).then((r) => r.items);

export const termsQueryOptions = (personId: number) => queryOptions({ queryKey: keys.people.detail(personId)._ctx.terms.queryKey, queryFn: () => getTerms(personId) });

export const useTerms = (personId: number) => useQuery(termsQueryOptions(personId));
