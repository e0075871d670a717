import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';

/** What the e-mailed sign-up link will make; `passwordNeeded` when opened in another browser than the one that signed up. */
export interface SignUpPreview {
  email: string;
  displayName: string;
  workspaceName: string;
  passwordNeeded: boolean;
}

export const getSignUpPreview = (token: string) => apiFetch<SignUpPreview>(`/auth/sign-up/preview?token=${encodeURIComponent(token)}`);

export const signUpPreviewQueryOptions = (token: string) =>
  queryOptions({ queryKey: ['auth', 'sign-up-preview', token], queryFn: () => getSignUpPreview(token), enabled: token.length > 0, staleTime: Infinity });

export const useSignUpPreview = (token: string) => useQuery(signUpPreviewQueryOptions(token));
