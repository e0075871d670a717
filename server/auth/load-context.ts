import type { Request, RequestHandler } from 'express';
import { resolveMembership, type ResolvedMembership } from './service';
import './context';

// Passport's deserializeUser reads the user and the membership in one query; the membership
// waits here for loadAuthContext so the request does not ask the database twice.
const preloaded = new WeakMap<Request, ResolvedMembership | null>();

export function rememberMembership(req: Request, membership: ResolvedMembership | null): void {
  preloaded.set(req, membership);
}

/**
 * Sets req.auth from the session: the signed-in user, the workspace the session names (only if
 * the user is still a member of it; otherwise their first workspace) and their role there.
 * Membership is read on every request, so a removed member loses access at once.
 */
export const loadAuthContext: RequestHandler = async (req, _res, next) => {
  if (!req.user) return next();
  const membership = preloaded.has(req) ? preloaded.get(req)! : await resolveMembership(req.user.id, req.session.workspaceId);
  preloaded.delete(req);
  if (membership) {
    req.auth = { userId: req.user.id, ...membership };
    if (req.session.workspaceId !== membership.workspaceId) req.session.workspaceId = membership.workspaceId;
  } else if (req.session.workspaceId !== undefined) {
    delete req.session.workspaceId;
  }
  next();
};
