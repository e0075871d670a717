import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { AbsenceDto, requestAbsenceBody } from '@/shared/api/absences';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** A staff request: it waits for a coordinator's decision. */
export const requestMyAbsence = (body: z.output<typeof requestAbsenceBody>) => apiFetch<AbsenceDto>('/me/absences', { method: 'POST', body });

export function useRequestMyAbsence() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: requestMyAbsence, onSuccess: () => queryClient.invalidateQueries({ queryKey: keys.me.absences.queryKey }) });
}
