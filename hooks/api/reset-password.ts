import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ResetPasswordInput } from '@/shared/auth/schemas';
import { apiFetch } from './api-client';
import type { Session } from './get-session';
import { replaceSession } from './session-cache';

/** Sets the new password and signs in (the server ends every other session of the account). */
export const resetPassword = (input: ResetPasswordInput) => apiFetch<Session>('/auth/reset-password', { method: 'POST', body: input });

export function useResetPassword() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: resetPassword, onSuccess: (session) => replaceSession(queryClient, session) });
}
