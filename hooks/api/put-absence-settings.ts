import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AbsenceSettings } from '@/shared/api/absences';
import { apiFetch } from './api-client';
import { absenceSettingsQueryOptions } from './get-absence-settings';
import { invalidateAbsences } from './invalidate-absences';

export const putAbsenceSettings = (body: AbsenceSettings) => apiFetch<AbsenceSettings>('/absences/settings', { method: 'PUT', body });

export function usePutAbsenceSettings() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: putAbsenceSettings,
    onSuccess: (settings) => {
      queryClient.setQueryData(absenceSettingsQueryOptions().queryKey, settings);
      // Credited hours shown in the lists follow the defaults.
      invalidateAbsences(queryClient);
    },
  });
}
