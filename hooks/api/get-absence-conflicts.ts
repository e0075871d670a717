import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AbsenceConflictDto } from '@/shared/api/absences';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export type { AbsenceConflictDto };

/** Seats of solved or published rosters an approved absence takes away ("needs cover"). */
export const getAbsenceConflicts = () => apiFetch<{ items: AbsenceConflictDto[] }>('/absences/conflicts').then((r) => r.items);

export const absenceConflictsQueryOptions = () => queryOptions({ queryKey: keys.absences.conflicts.queryKey, queryFn: getAbsenceConflicts });

export const useAbsenceConflicts = () => useQuery(absenceConflictsQueryOptions());
