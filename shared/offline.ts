/**
 * What the web app's service worker keeps for reading offline, named once for the worker's build
 * (server/bootstrap/web-finish.ts) and the client that clears it (hooks/offline/).
 * Only answers about the signed-in person themselves: their session and their published shifts.
 */
export const OFFLINE_CACHE = 'rotaloom-mine';

/** API paths (GET) whose last good answer is kept; nothing that lists other people's data. */
export const OFFLINE_API_PATHS = ['/api/auth/session', '/api/me/shifts'] as const;

/** Header the worker adds to the copy it keeps (never to a fresh answer): when it was saved, ISO 8601. */
export const SAVED_AT_HEADER = 'x-rotaloom-saved-at';

/**
 * localStorage key naming whose copies those are (`userId:workspaceId`), set while someone is
 * signed in on this browser (hooks/offline/) and read by the app shell's first script, which asks
 * for the person's own answers beside the code only then (server/bootstrap/web-finish.ts).
 */
export const OFFLINE_OWNER_KEY = 'rotaloom-offline-owner';
