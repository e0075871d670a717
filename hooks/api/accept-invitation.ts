import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AcceptInvitationInput } from '@/shared/auth/schemas';
import { apiFetch } from './api-client';
import type { Session } from './get-session';
import { replaceSession } from './session-cache';

/** Joins the invitation's workspace (making the account first when the body has a name and password). */
export const acceptInvitation = (input: AcceptInvitationInput) => apiFetch<Session>('/invitations/accept', { method: 'POST', body: input });

export function useAcceptInvitation() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: acceptInvitation, onSuccess: (session) => replaceSession(queryClient, session) });
}
