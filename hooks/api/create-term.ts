import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { createTermBody, TermDto } from '@/shared/api/terms';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const createTerm = ({ personId, ...body }: z.output<typeof createTermBody> & { personId: number }) => apiFetch<TermDto>(`/people/${personId}/terms`, { method: 'POST', body });

export function useCreateTerm() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createTerm, onSuccess: (_d, v) => queryClient.invalidateQueries({ queryKey: keys.people.detail(v.personId)._ctx.terms.queryKey }) });
}
