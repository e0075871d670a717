import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { sessionQueryOptions } from './get-session';

export const signOut = () => apiFetch<void>('/auth/sign-out', { method: 'POST', body: {} });

export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSuccess: () => {
      queryClient.setQueryData(sessionQueryOptions().queryKey, null);
      void queryClient.invalidateQueries();
    },
  });
}
