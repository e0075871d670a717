import type { RequestHandler } from 'express';
import { resolveMembership } from './service';
import './context';

/**
 * Sets req.auth from the session: the signed-in user, the workspace the session names (only if
 * the user is still a member of it; otherwise their first workspace) and their role there.
 * Membership is read on every request, so a removed member loses access at once.
 */
export const loadAuthContext: RequestHandler = async (req, _res, next) => {
  if (!req.user) return next();
  const membership = await resolveMembership(req.user.id, req.session.workspaceId);
  if (membership) {
    req.auth = { userId: req.user.id, ...membership };
    if (req.session.workspaceId !== membership.workspaceId) req.session.workspaceId = membership.workspaceId;
  } else if (req.session.workspaceId !== undefined) {
    delete req.session.workspaceId;
  }
  next();
};
