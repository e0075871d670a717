import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch, ApiError } from './api-client';

export interface Session {
  user: { id: number; email: string; displayName: string };
  workspace: { id: number; name: string } | null;
  role: 'admin' | 'coordinator' | 'staff' | null;
  workspaces: Array<{ id: number; name: string; role: 'admin' | 'coordinator' | 'staff' }>;
}

/**
 * The signed-in user and workspace, or null when signed out. The server answers a signed-out
 * visitor with 200 `{ user: null }` (so browsers log no failed request on the front page); a 401
 * is treated the same way.
 */
export async function getSession(): Promise<Session | null> {
  try {
    const session = await apiFetch<Session | { user: null }>('/auth/session');
    return session.user ? (session as Session) : null;
  } catch (err) {
    if (err instanceof ApiError && err.status === 401) return null;
    throw err;
  }
}

export const sessionQueryOptions = () => queryOptions({ queryKey: ['session'], queryFn: getSession, staleTime: 60_000 });

export const useSession = () => useQuery(sessionQueryOptions());
