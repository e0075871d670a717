import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { PatternInput } from './preview-pattern';
import type { PatternDto } from './roster-types';
import { keys } from './query-keys';

export const createPattern = ({ rosterId, pattern }: { rosterId: number; pattern: PatternInput }) =>
  apiFetch<PatternDto>(`/rosters/${rosterId}/patterns`, { method: 'POST', body: pattern });

/** A new pattern adds shifts and bumps the roster's version: refresh everything under the roster. */
export function useCreatePattern() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createPattern, onSuccess: (_d, v) => queryClient.invalidateQueries({ queryKey: keys.rosters.detail(v.rosterId).queryKey }) });
}
