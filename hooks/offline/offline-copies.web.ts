import { OFFLINE_CACHE, OFFLINE_OWNER_KEY as OWNER_KEY } from '@/shared/offline';
import { registerServiceWorker } from './service-worker';

/**
 * The saved copies (session, my shifts) belong to whoever was signed in, in which workspace, when
 * they were saved. Whenever that changes — signed out, another person, another workspace — they
 * are deleted before anything can show them, so one phone never shows one person another's shifts.
 */
export async function keepOfflineCopiesFor(session: { user: { id: number }; workspace: { id: number } | null } | null): Promise<void> {
  const owner = session ? `${session.user.id}:${session.workspace?.id ?? '-'}` : null;
  // Every session the client learns of passes here: the worker is installed once someone is signed in.
  if (session) registerServiceWorker();
  const stored = readOwner();
  if (owner !== null && owner === stored) return;
  if (typeof caches !== 'undefined') await caches.delete(OFFLINE_CACHE);
  writeOwner(owner);
}

function readOwner(): string | null {
  try {
    return localStorage.getItem(OWNER_KEY);
  } catch {
    return null;
  }
}

function writeOwner(owner: string | null): void {
  try {
    if (owner) localStorage.setItem(OWNER_KEY, owner);
    else localStorage.removeItem(OWNER_KEY);
  } catch {
    // Storage refused (private mode): the copies were deleted, which is the safe side.
  }
}
