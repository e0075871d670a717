import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { FinishSignUpInput } from '@/shared/auth/schemas';
import { apiFetch } from './api-client';
import type { Session } from './get-session';
import { replaceSession } from './session-cache';

/** Makes the account and workspace from the e-mailed link, and signs in. */
export const finishSignUp = (input: FinishSignUpInput) => apiFetch<Session>('/auth/sign-up/finish', { method: 'POST', body: input });

export function useFinishSignUp() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: finishSignUp, onSuccess: (session) => replaceSession(queryClient, session) });
}
