import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { AbsenceDto, absenceDecisionBody } from '@/shared/api/absences';
import { apiFetch } from './api-client';
import { invalidateAbsences } from './invalidate-absences';

/** Approve or decline a staff request; the person gets an e-mail (server/absences/notify.ts). */
export const decideAbsence = ({ id, ...body }: z.input<typeof absenceDecisionBody> & { id: number }) => apiFetch<AbsenceDto>(`/absences/${id}/decision`, { method: 'POST', body });

export function useDecideAbsence() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: decideAbsence, onSuccess: () => invalidateAbsences(queryClient) });
}
