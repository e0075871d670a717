import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** What the e-mailed sign-up link will make; `passwordNeeded` when opened in another browser than the one that signed up. */
export interface SignUpPreview {
  email: string;
  displayName: string;
  workspaceName: string;
  passwordNeeded: boolean;
}

export const getSignUpPreview = (token: string) => apiFetch<SignUpPreview>(`/auth/sign-up/preview?token=${encodeURIComponent(token)}`);

export const signUpPreviewQueryOptions = (token: string) =>
  queryOptions({ queryKey: keys.auth.signUpPreview(token).queryKey, queryFn: () => getSignUpPreview(token), enabled: token.length > 0, staleTime: Infinity });

export const useSignUpPreview = (token: string) => useQuery(signUpPreviewQueryOptions(token));
