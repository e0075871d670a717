import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { wishBody } from '@/shared/api/rosters';
import { apiFetch } from './api-client';
import type { RosterWish } from './get-roster-wishes';
import { keys } from './query-keys';

/** A coordinator enters a wish for anyone, also people without a login and after the staff deadline. */
export const createRosterWish = ({ rosterId, ...body }: z.output<typeof wishBody> & { rosterId: number }) => apiFetch<RosterWish>(`/rosters/${rosterId}/wishes`, { method: 'POST', body });

export function useCreateRosterWish() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createRosterWish, onSuccess: (_d, v) => {
      void queryClient.invalidateQueries({ queryKey: keys.rosters.detail(v.rosterId)._ctx.wishes.queryKey });
      // A wish write moves the roster's version on (touchRoster), which its settings form sends.
      void queryClient.invalidateQueries({ queryKey: keys.rosters.detail(v.rosterId).queryKey, exact: true });
    },
  });
}
