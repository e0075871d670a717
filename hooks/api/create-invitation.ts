import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { InviteInput } from '@/shared/auth/schemas';
import { apiFetch } from './api-client';
import { invitationsQueryOptions, type Invitation } from './get-invitations';

export const createInvitation = (input: InviteInput) => apiFetch<{ invitation: Invitation; mailSent: boolean }>('/invitations', { method: 'POST', body: input });

export function useCreateInvitation() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createInvitation, onSuccess: () => queryClient.invalidateQueries({ queryKey: invitationsQueryOptions().queryKey }) });
}
