import type { QueryClient } from '@tanstack/react-query';
import { keepOfflineCopiesFor } from '@/hooks/offline/offline-copies';
import { sessionQueryOptions, type Session } from './get-session';

/**
 * After the session changes workspace (switch, new workspace, accepted invitation) every other
 * cached answer belongs to the old workspace: keep the new session, drop the rest, and the
 * service worker's offline copies with it (signing out clears them).
 */
export function replaceSession(queryClient: QueryClient, session: Session | null): void {
  const key = sessionQueryOptions().queryKey;
  queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== key[0] });
  queryClient.setQueryData(key, session);
  void keepOfflineCopiesFor(session);
}
