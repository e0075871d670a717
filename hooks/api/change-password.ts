import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ChangePasswordInput } from '@/shared/auth/schemas';
import { apiFetch } from './api-client';
import { sessionQueryOptions, type Session } from './get-session';

export const changePassword = (input: ChangePasswordInput) => apiFetch<Session>('/auth/change-password', { method: 'POST', body: input });

export function useChangePassword() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: changePassword, onSuccess: (session) => queryClient.setQueryData(sessionQueryOptions().queryKey, session) });
}
