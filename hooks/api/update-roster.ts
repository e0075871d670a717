import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { RosterDto, updateRosterBody } from '@/shared/api/rosters';
import { apiFetch } from './api-client';
import { rosterQueryOptions } from './get-roster';
import { keys } from './query-keys';

/** Sends the version the form loaded; a 409 means the roster changed since (e.g. a shift edit). */
export const updateRoster = ({ id, ...body }: z.output<typeof updateRosterBody> & { id: number }) => apiFetch<RosterDto>(`/rosters/${id}`, { method: 'PATCH', body });

export function useUpdateRoster() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateRoster,
    onSuccess: (roster) => {
      queryClient.setQueryData(rosterQueryOptions(roster.id).queryKey, roster);
      void queryClient.invalidateQueries({ queryKey: keys.rosters._def });
    },
  });
}
