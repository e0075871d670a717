import type { Request, RequestHandler } from 'express';
import { resolveMembership, type SignedInAccount } from './service';
import './context';

// The session store reads the account (user and membership) with the session row, or passport's
// deserializeUser reads it with one query: either way it waits here, per request, so that
// deserializeUser and loadAuthContext do not ask the database again.
const accounts = new WeakMap<Request, SignedInAccount>();

export function rememberAccount(req: Request, account: SignedInAccount): void {
  accounts.set(req, account);
}

/** The account read for this request, if it is the given user's. */
export function preloadedAccount(req: Request, userId: number): SignedInAccount | undefined {
  const account = accounts.get(req);
  return account?.user.id === userId ? account : undefined;
}

/**
 * Sets req.auth from the session: the signed-in user, the workspace the session names (only if
 * the user is still a member of it; otherwise their first workspace) and their role there.
 * Membership is read on every request, so a removed member loses access at once.
 */
export const loadAuthContext: RequestHandler = async (req, _res, next) => {
  if (!req.user) return next();
  const account = preloadedAccount(req, req.user.id);
  const membership = account ? account.membership : await resolveMembership(req.user.id, req.session.workspaceId);
  if (membership) {
    req.auth = { userId: req.user.id, ...membership };
    if (req.session.workspaceId !== membership.workspaceId) req.session.workspaceId = membership.workspaceId;
  } else if (req.session.workspaceId !== undefined) {
    delete req.session.workspaceId;
  }
  next();
};
