import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { membersQueryOptions } from './get-members';
import { sessionQueryOptions } from './get-session';

export const removeMember = (userId: number) => apiFetch<void>(`/members/${userId}`, { method: 'DELETE' });

export function useRemoveMember() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: removeMember,
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: membersQueryOptions().queryKey });
      // An admin who left is no longer in this workspace: the session says where they are now.
      void queryClient.invalidateQueries({ queryKey: sessionQueryOptions().queryKey });
    },
  });
}
