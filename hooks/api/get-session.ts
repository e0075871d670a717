import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch, ApiError } from './api-client';

export type Role = 'admin' | 'coordinator' | 'staff';

/** As server/auth/service.ts sessionView answers it. */
export interface Session {
  user: { id: number; email: string; displayName: string; emailVerified: boolean; hasPassword: boolean; hasGoogle: boolean };
  workspace: { id: number; name: string; timeZone: string } | null;
  role: Role | null;
  /** The person record linked to the user in the current workspace (staff see their shifts through it). */
  personId: number | null;
  workspaces: Array<{ id: number; name: string; role: Role }>;
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
