import { useMutation } from '@tanstack/react-query';
import type { ChangeEmailInput } from '@/shared/auth/schemas';
import { apiFetch } from './api-client';

/** Sends a confirmation link to the new address; the address changes once it is opened. */
export const changeEmail = (input: ChangeEmailInput) => apiFetch<{ pendingEmail: string; message: string }>('/auth/change-email', { method: 'POST', body: input });

export const useChangeEmail = () => useMutation({ mutationFn: changeEmail });
