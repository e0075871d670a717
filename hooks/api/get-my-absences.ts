import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AbsenceDto } from '@/shared/api/absences';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** The signed-in person's own absences and requests. */
export const getMyAbsences = () => apiFetch<{ items: AbsenceDto[] }>('/me/absences').then((r) => r.items);

export const myAbsencesQueryOptions = () => queryOptions({ queryKey: keys.me.absences.queryKey, queryFn: getMyAbsences });

export const useMyAbsences = () => useQuery(myAbsencesQueryOptions());
