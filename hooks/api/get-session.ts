import { queryOptions, useQuery } from '@tanstack/react-query';
import { keepOfflineCopiesFor } from '@/hooks/offline/offline-copies';
import { apiFetch, ApiError } from './api-client';
import { keys } from './query-keys';

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
  let session: Session | null;
  try {
    const answer = await apiFetch<Session | { user: null }>('/auth/session');
    session = answer.user ? (answer as Session) : null;
  } catch (err) {
    if (!(err instanceof ApiError && err.status === 401)) throw err;
    session = null;
  }
  // Someone else signed in here (Google's redirect, an expired session): the old copies go first.
  await keepOfflineCopiesFor(session);
  return session;
}

export const sessionQueryOptions = () => queryOptions({ queryKey: keys.session.current.queryKey, queryFn: getSession, staleTime: 60_000 });

export const useSession = () => useQuery(sessionQueryOptions());
