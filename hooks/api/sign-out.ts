import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { replaceSession } from './session-cache';

export const signOut = () => apiFetch<void>('/auth/sign-out', { method: 'POST', body: {} });

export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    // Drop every cached answer rather than refetching it: signed out, each would only come back 401.
    onSuccess: () => replaceSession(queryClient, null),
  });
}
