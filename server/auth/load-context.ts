import type { Request, RequestHandler } from 'express';
import { resolveMembership, type ResolvedMembership, type SignedInAccount } from './service';
import './context';

// The session store reads the account with the session row, and passport's deserializeUser the
// membership with the user, so that a request asks the database once; what they read waits here,
// per request, for deserializeUser and loadAuthContext.
const preloadedAccounts = new WeakMap<Request, SignedInAccount>();
const preloadedMemberships = new WeakMap<Request, ResolvedMembership | null>();

export function rememberAccount(req: Request, account: SignedInAccount): void {
  preloadedAccounts.set(req, account);
}

/** The account read with this request's session, if it is the given user's. */
export function preloadedAccount(req: Request, userId: number): SignedInAccount | undefined {
  const account = preloadedAccounts.get(req);
  preloadedAccounts.delete(req);
  return account?.user.id === userId ? account : undefined;
}

export function rememberMembership(req: Request, membership: ResolvedMembership | null): void {
  preloadedMemberships.set(req, membership);
}

/**
 * Sets req.auth from the session: the signed-in user, the workspace the session names (only if
 * the user is still a member of it; otherwise their first workspace) and their role there.
 * Membership is read on every request, so a removed member loses access at once.
 */
export const loadAuthContext: RequestHandler = async (req, _res, next) => {
  if (!req.user) return next();
  const membership = preloadedMemberships.has(req) ? preloadedMemberships.get(req)! : await resolveMembership(req.user.id, req.session.workspaceId);
  preloadedMemberships.delete(req);
  if (membership) {
    req.auth = { userId: req.user.id, ...membership };
    if (req.session.workspaceId !== membership.workspaceId) req.session.workspaceId = membership.workspaceId;
  } else if (req.session.workspaceId !== undefined) {
    delete req.session.workspaceId;
  }
  next();
};
