import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AbsenceSettings } from '@/shared/api/absences';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export type { AbsenceSettings };

export const getAbsenceSettings = () => apiFetch<AbsenceSettings>('/absences/settings');

export const absenceSettingsQueryOptions = () => queryOptions({ queryKey: keys.absences.settings.queryKey, queryFn: getAbsenceSettings });

export const useAbsenceSettings = () => useQuery(absenceSettingsQueryOptions());
