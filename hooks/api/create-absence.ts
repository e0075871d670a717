import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { AbsenceDto, createAbsenceBody } from '@/shared/api/absences';
import { apiFetch } from './api-client';
import { invalidateAbsences } from './invalidate-absences';

/** A coordinator's absence is approved at once (201). */
export const createAbsence = (input: z.output<typeof createAbsenceBody>) => apiFetch<AbsenceDto>('/absences', { method: 'POST', body: input });

export function useCreateAbsence() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createAbsence, onSuccess: () => invalidateAbsences(queryClient) });
}
