import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SignInInput } from '@/shared/auth/schemas';
import { keepOfflineCopiesFor } from '@/hooks/offline/offline-copies';
import { apiFetch } from './api-client';
import { sessionQueryOptions, type Session } from './get-session';

export const signIn = (input: SignInInput) => apiFetch<Session>('/auth/sign-in', { method: 'POST', body: input });

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (session) => {
      queryClient.setQueryData(sessionQueryOptions().queryKey, session);
      void keepOfflineCopiesFor(session);
    },
  });
}
