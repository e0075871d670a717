import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export interface Providers {
  password: boolean;
  google: boolean;
}

export const getProviders = () => apiFetch<Providers>('/auth/providers');

export const providersQueryOptions = () => queryOptions({ queryKey: keys.auth.providers.queryKey, queryFn: getProviders, staleTime: Infinity });

export const useProviders = () => useQuery(providersQueryOptions());

/** Where the browser goes to start Google sign-in (a full page load, not a fetch). */
export const googleSignInUrl = (returnTo?: string) => `/api/auth/google${returnTo ? `?returnTo=${encodeURIComponent(returnTo)}` : ''}`;
