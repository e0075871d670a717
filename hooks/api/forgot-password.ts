import { useMutation } from '@tanstack/react-query';
import type { ForgotPasswordInput } from '@/shared/auth/schemas';
import { apiFetch } from './api-client';

export const forgotPassword = (input: ForgotPasswordInput) => apiFetch<{ message: string }>('/auth/forgot-password', { method: 'POST', body: input });

export const useForgotPassword = () => useMutation({ mutationFn: forgotPassword });
