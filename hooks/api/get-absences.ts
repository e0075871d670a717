import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { z } from 'zod';
import type { AbsenceDto, absencesListQuery } from '@/shared/api/absences';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export type { AbsenceDto };
export type AbsencesFilter = z.input<typeof absencesListQuery>;

export function getAbsences(filter: AbsencesFilter = {}) {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(filter)) if (v !== undefined && v !== null && v !== '') params.set(k, String(v));
  const qs = params.toString();
  return apiFetch<{ items: AbsenceDto[] }>(`/absences${qs ? `?${qs}` : ''}`).then((r) => r.items);
}

/** Every absence list shares the ['absences', 'list'] prefix, so one invalidation refreshes them all. */
export const absencesQueryOptions = (filter: AbsencesFilter = {}) =>
  queryOptions({ queryKey: keys.absences.list(filter).queryKey, queryFn: () => getAbsences(filter), placeholderData: keepPreviousData });

export const useAbsences = (filter: AbsencesFilter = {}) => useQuery(absencesQueryOptions(filter));
