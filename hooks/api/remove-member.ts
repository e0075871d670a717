import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { membersQueryOptions } from './get-members';

export const removeMember = (userId: number) => apiFetch<void>(`/members/${userId}`, { method: 'DELETE' });

export function useRemoveMember() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: removeMember, onSuccess: () => queryClient.invalidateQueries({ queryKey: membersQueryOptions().queryKey }) });
}
