import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { InviteInput } from '@/shared/auth/schemas';
import { apiFetch } from './api-client';
import type { Invitation } from './get-invitations';
import { keys } from './query-keys';

export const createInvitation = (input: InviteInput) => apiFetch<{ invitation: Invitation; mailSent: boolean }>('/invitations', { method: 'POST', body: input });

export function useCreateInvitation() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createInvitation, onSuccess: () => queryClient.invalidateQueries({ queryKey: keys.invitations._def }) });
}
