import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AbsenceSettings } from '@/shared/api/absences';
import { apiFetch } from './api-client';

export type { AbsenceSettings };

export const getAbsenceSettings = () => apiFetch<AbsenceSettings>('/absences/settings');

export const absenceSettingsQueryOptions = () => queryOptions({ queryKey: ['absences', 'settings'], queryFn: getAbsenceSettings });

export const useAbsenceSettings = () => useQuery(absenceSettingsQueryOptions());
