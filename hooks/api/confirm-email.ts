import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ConfirmEmailInput } from '@/shared/auth/schemas';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const confirmEmail = (input: ConfirmEmailInput) => apiFetch<{ email: string; emailVerified: true }>('/auth/confirm-email', { method: 'POST', body: input });

export function useConfirmEmail() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: confirmEmail, onSuccess: () => queryClient.invalidateQueries({ queryKey: keys.session._def }) });
}
