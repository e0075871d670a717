import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { AbsenceDto, updateAbsenceBody } from '@/shared/api/absences';
import { apiFetch } from './api-client';
import { invalidateAbsences } from './invalidate-absences';

/** Sends the version the form loaded; a 409 means someone else changed it first. */
export const updateAbsence = ({ id, ...body }: z.output<typeof updateAbsenceBody> & { id: number }) => apiFetch<AbsenceDto>(`/absences/${id}`, { method: 'PATCH', body });

export function useUpdateAbsence() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: updateAbsence, onSuccess: () => invalidateAbsences(queryClient) });
}
