import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const revokeInvitation = (id: number) => apiFetch<void>(`/invitations/${id}`, { method: 'DELETE' });

export function useRevokeInvitation() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: revokeInvitation, onSuccess: () => queryClient.invalidateQueries({ queryKey: keys.invitations._def }) });
}
