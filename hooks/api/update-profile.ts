import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { UpdateProfileInput } from '@/shared/auth/schemas';
import { apiFetch } from './api-client';
import { sessionQueryOptions, type Session } from './get-session';

export const updateProfile = (input: UpdateProfileInput) => apiFetch<Session>('/auth/profile', { method: 'PATCH', body: input });

export function useUpdateProfile() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: updateProfile, onSuccess: (session) => queryClient.setQueryData(sessionQueryOptions().queryKey, session) });
}
