import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { createRosterBody } from '@/shared/api/rosters';
import { apiFetch } from './api-client';
import { rostersQueryOptions } from './get-rosters';
import type { RosterDto } from './roster-types';

export const createRoster = (input: z.input<typeof createRosterBody>) => apiFetch<RosterDto>('/rosters', { method: 'POST', body: input });

export function useCreateRoster() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createRoster, onSuccess: () => queryClient.invalidateQueries({ queryKey: rostersQueryOptions().queryKey }) });
}
