import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { TermDto, updateTermBody } from '@/shared/api/terms';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** Sends the version the form loaded; a 409 means someone else changed the term first. */
export const updateTerm = ({ personId, termId, ...body }: z.output<typeof updateTermBody> & { personId: number; termId: number }) =>
  apiFetch<TermDto>(`/people/${personId}/terms/${termId}`, { method: 'PATCH', body });

export function useUpdateTerm() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: updateTerm, onSuccess: (_d, v) => queryClient.invalidateQueries({ queryKey: keys.people.detail(v.personId)._ctx.terms.queryKey }) });
}
