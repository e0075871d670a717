import { useMutation } from '@tanstack/react-query';
import type { SignUpInput } from '@/shared/auth/schemas';
import { apiFetch } from './api-client';

/** Asks for a sign-up; the e-mailed link finishes it. The answer is the same whether or not the address has an account. */
export const signUp = (input: SignUpInput) => apiFetch<{ email: string; message: string }>('/auth/sign-up', { method: 'POST', body: input });

export const useSignUp = () => useMutation({ mutationFn: signUp });
