import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const removeMember = (userId: number) => apiFetch<void>(`/members/${userId}`, { method: 'DELETE' });

export function useRemoveMember() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: removeMember,
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: keys.members._def });
      // An admin who left is no longer in this workspace: the session says where they are now.
      void queryClient.invalidateQueries({ queryKey: keys.session._def });
    },
  });
}
