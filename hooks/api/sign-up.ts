import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SignUpInput } from '@/shared/auth/schemas';
import { apiFetch } from './api-client';
import type { Session } from './get-session';
import { replaceSession } from './session-cache';

export const signUp = (input: SignUpInput) => apiFetch<Session>('/auth/sign-up', { method: 'POST', body: input });

export function useSignUp() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: signUp, onSuccess: (session) => replaceSession(queryClient, session) });
}
