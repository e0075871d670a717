import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { createRosterBody } from '@/shared/api/rosters';
import { apiFetch } from './api-client';
import type { RosterDto } from './roster-types';
import { keys } from './query-keys';

export const createRoster = (input: z.input<typeof createRosterBody>) => apiFetch<RosterDto>('/rosters', { method: 'POST', body: input });

export function useCreateRoster() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createRoster, onSuccess: () => queryClient.invalidateQueries({ queryKey: keys.rosters.list.queryKey }) });
}
