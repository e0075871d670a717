import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { updateWishBody } from '@/shared/api/rosters';
import { apiFetch } from './api-client';
import type { RosterWish } from './get-roster-wishes';
import { keys } from './query-keys';

export const updateRosterWish = ({ rosterId, id, ...body }: z.output<typeof updateWishBody> & { rosterId: number; id: number }) =>
  apiFetch<RosterWish>(`/rosters/${rosterId}/wishes/${id}`, { method: 'PATCH', body });

export function useUpdateRosterWish() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: updateRosterWish, onSuccess: (_d, v) => {
      void queryClient.invalidateQueries({ queryKey: keys.rosters.detail(v.rosterId)._ctx.wishes.queryKey });
      // A wish write moves the roster's version on (touchRoster), which its settings form sends.
      void queryClient.invalidateQueries({ queryKey: keys.rosters.detail(v.rosterId).queryKey, exact: true });
    },
  });
}
