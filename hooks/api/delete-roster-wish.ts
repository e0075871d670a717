import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const deleteRosterWish = ({ rosterId, id }: { rosterId: number; id: number }) => apiFetch<void>(`/rosters/${rosterId}/wishes/${id}`, { method: 'DELETE' });

export function useDeleteRosterWish() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: deleteRosterWish, onSuccess: (_d, v) => {
      void queryClient.invalidateQueries({ queryKey: keys.rosters.detail(v.rosterId)._ctx.wishes.queryKey });
      // A wish write moves the roster's version on (touchRoster), which its settings form sends.
      void queryClient.invalidateQueries({ queryKey: keys.rosters.detail(v.rosterId).queryKey, exact: true });
    },
  });
}
