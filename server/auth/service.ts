import { Op, QueryTypes, type Transaction } from 'sequelize';
import { Membership, User, Workspace, type Role } from '../db/models';
import { HttpError } from '../http/errors';
import { checkPassword, hashPassword } from './passwords';
import { AccountToken, type TokenPurpose } from './models';
import { hashToken, newToken } from './tokens';

export const normalizeEmail = (email: string) => email.trim().toLowerCase();

const userView = (u: User) => ({ id: u.id, email: u.email, displayName: u.displayName });

// ---------------------------------------------------------------- password sign-in

/** The account for this e-mail and password, or null; the caller answers both failures alike. */
export async function verifyPassword(email: string, password: string): Promise<Express.User | null> {
  const user = await User.scope('withPassword').findOne({ where: { email: normalizeEmail(email) } });
  const ok = await checkPassword(password, user?.passwordHash);
  return ok && user ? userView(user) : null;
}

// ---------------------------------------------------------------- session view

export interface SessionView {
  user: { id: number; email: string; displayName: string; emailVerified: boolean; hasPassword: boolean; hasGoogle: boolean };
  workspace: { id: number; name: string; timeZone: string } | null;
  role: Role | null;
  personId: number | null;
  workspaces: Array<{ id: number; name: string; role: Role }>;
}

export async function listUserWorkspaces(userId: number): Promise<Array<{ id: number; name: string; role: Role; timeZone: string }>> {
  const memberships = await Membership.findAll({ where: { userId }, include: [{ model: Workspace, required: true }], order: [['id', 'ASC']] });
  return memberships.map((m) => {
    const w = (m as Membership & { Workspace: Workspace }).Workspace;
    return { id: w.id, name: w.name, role: m.role, timeZone: w.timeZone };
  });
}

export async function sessionView(userId: number, workspaceId: number | null, personId: number | null): Promise<SessionView> {
  const user = await User.scope('withPassword').findByPk(userId);
  if (!user) throw new HttpError(401, 'unauthenticated', 'Please sign in');
  const workspaces = await listUserWorkspaces(userId);
  const current = workspaces.find((w) => w.id === workspaceId) ?? null;
  return {
    user: { id: user.id, email: user.email, displayName: user.displayName, emailVerified: user.emailVerified, hasPassword: Boolean(user.passwordHash), hasGoogle: Boolean(user.googleId) },
    workspace: current ? { id: current.id, name: current.name, timeZone: current.timeZone } : null,
    role: current?.role ?? null,
    personId: current ? personId : null,
    workspaces: workspaces.map(({ id, name, role }) => ({ id, name, role })),
  };
}

export type ResolvedMembership = { workspaceId: number; role: Role; personId: number | null };

// The membership the session should use: the workspace it names if the user is still a member
// of it, else their first membership, with the person linked to them there.
const MEMBERSHIP_COLUMNS = `m.workspace_id, m.role,
  (SELECT p.id FROM people p WHERE p.workspace_id = m.workspace_id AND p.user_id = m.user_id ORDER BY p.id LIMIT 1) AS person_id`;

type MembershipRow = { workspace_id: number | null; role: Role | null; person_id: number | null };

const toMembership = (row: MembershipRow | undefined): ResolvedMembership | null =>
  row && row.workspace_id !== null && row.role !== null ? { workspaceId: row.workspace_id, role: row.role, personId: row.person_id ?? null } : null;

/** A signed-in account as one request needs it: the user and the membership it works in. */
export type SignedInAccount = { user: Express.User; membership: ResolvedMembership | null };

type AccountRow = { uid: number | null; email: string; display_name: string } & MembershipRow;
const ACCOUNT_COLUMNS = `u.id AS uid, u.email, u.display_name, ${MEMBERSHIP_COLUMNS}`;
const toAccount = (row: AccountRow): SignedInAccount | null =>
  row.uid === null ? null : { user: { id: row.uid, email: row.email, displayName: row.display_name }, membership: toMembership(row) };

/** The user and their membership in one query; null when the user no longer exists. */
export async function loadSignedInUser(userId: number, wanted: number | undefined): Promise<SignedInAccount | null> {
  const rows = await User.sequelize!.query<AccountRow>(
    `SELECT ${ACCOUNT_COLUMNS} FROM users u LEFT JOIN memberships m ON m.user_id = u.id
      WHERE u.id = ? ORDER BY (m.workspace_id = ?) DESC, m.id ASC LIMIT 1`,
    { replacements: [userId, wanted ?? 0], type: QueryTypes.SELECT },
  );
  return rows[0] ? toAccount(rows[0]) : null;
}

/**
 * A live session (expired rows count as none) together with its account, in ONE query: this runs
 * on every request, so the session read, passport's user lookup and the membership lookup share a
 * round trip. The account is the one the row's user_id names (kept equal to the session's
 * passport user by the store); the membership prefers the workspace the session data names.
 */
export async function loadSessionWithAccount(sid: string, lifetimeMs: number): Promise<{ data: string; expires: number; account: SignedInAccount | null } | null> {
  const now = Date.now();
  const rows = await User.sequelize!.query<{ data: string; expires: Date; created_at: Date } & AccountRow>(
    `SELECT s.data, s.expires, s.created_at, ${ACCOUNT_COLUMNS}
       FROM sessions s LEFT JOIN users u ON u.id = s.user_id LEFT JOIN memberships m ON m.user_id = u.id
      WHERE s.sid = ? AND s.expires > ? AND s.created_at > ?
      ORDER BY (m.workspace_id = JSON_VALUE(s.data, '$.workspaceId')) DESC, m.id ASC LIMIT 1`,
    { replacements: [sid, new Date(now), new Date(now - lifetimeMs)], type: QueryTypes.SELECT },
  );
  const row = rows[0];
  if (!row) return null;
  const expires = Math.min(new Date(row.expires).getTime(), new Date(row.created_at).getTime() + lifetimeMs);
  return { data: row.data, expires, account: toAccount(row) };
}

/** The membership the session should use: the one it names if still valid, else the user's first. */
export async function resolveMembership(userId: number, wanted: number | undefined): Promise<ResolvedMembership | null> {
  const rows = await Membership.sequelize!.query<MembershipRow>(
    `SELECT ${MEMBERSHIP_COLUMNS} FROM memberships m WHERE m.user_id = ? ORDER BY (m.workspace_id = ?) DESC, m.id ASC LIMIT 1`,
    { replacements: [userId, wanted ?? 0], type: QueryTypes.SELECT },
  );
  return toMembership(rows[0]);
}

// ---------------------------------------------------------------- sign-up and Google

export async function createWorkspaceFor(userId: number, name: string, timeZone: string | undefined, transaction?: Transaction): Promise<Workspace> {
  const workspace = await Workspace.create({ name, timeZone: validTimeZone(timeZone) }, { transaction });
  await Membership.create({ workspaceId: workspace.id, userId, role: 'admin' }, { transaction });
  return workspace;
}

function validTimeZone(zone: string | undefined): string {
  if (!zone) return 'UTC';
  try {
    new Intl.DateTimeFormat('en', { timeZone: zone });
    return zone;
  } catch {
    return 'UTC';
  }
}

export interface GoogleIdentity {
  googleId: string;
  displayName: string;
  email: string | null;
  emailVerified: boolean;
}

/**
 * Finds or makes the user for a Google identity. A Google account and a password account with
 * the same verified e-mail become one user. If the password account's address was never
 * verified, its password is dropped on linking: whoever set it had not shown they own the address.
 */
export async function googleSignIn(identity: GoogleIdentity, options: { createWorkspace: boolean }): Promise<{ ok: true; user: Express.User } | { ok: false; message: string }> {
  const byGoogle = await User.findOne({ where: { googleId: identity.googleId } });
  if (byGoogle) return { ok: true, user: userView(byGoogle) };
  if (!identity.email) return { ok: false, message: 'Google did not share an e-mail address' };
  const email = normalizeEmail(identity.email);
  const byEmail = await User.scope('withPassword').findOne({ where: { email } });
  if (byEmail) {
    if (!identity.emailVerified) return { ok: false, message: 'This Google address is not verified; verify it with Google or sign in with your password' };
    if (byEmail.googleId) return { ok: false, message: 'This e-mail address is already linked to another Google account' };
    await byEmail.update({ googleId: identity.googleId, emailVerified: true, ...(byEmail.emailVerified ? {} : { passwordHash: null }) });
    return { ok: true, user: userView(byEmail) };
  }
  const user = await User.sequelize!.transaction(async (transaction) => {
    const created = await User.create({ email, displayName: identity.displayName.slice(0, 120), passwordHash: null, googleId: identity.googleId, emailVerified: identity.emailVerified }, { transaction });
    if (options.createWorkspace) await createWorkspaceFor(created.id, `${identity.displayName.slice(0, 100)}'s team`, undefined, transaction);
    return created;
  });
  return { ok: true, user: userView(user) };
}

// ---------------------------------------------------------------- e-mailed tokens

export const RESET_VALID_MS = 60 * 60 * 1000;
export const CONFIRM_VALID_MS = 48 * 60 * 60 * 1000;

export async function issueToken(userId: number, purpose: TokenPurpose, validForMs: number, email: string | null = null): Promise<string> {
  // An older unused link of the same kind stops working once a newer one is sent.
  await AccountToken.update({ usedAt: new Date() }, { where: { userId, purpose, usedAt: null } });
  const { token, hash } = newToken();
  await AccountToken.create({ userId, purpose, tokenHash: hash, email, expiresAt: new Date(Date.now() + validForMs) });
  return token;
}

/** How many links of this kind went to the user in the last hour (caps mail sent to one inbox). */
export async function recentTokenCount(userId: number, purpose: TokenPurpose): Promise<number> {
  return AccountToken.count({ where: { userId, purpose, createdAt: { [Op.gte]: new Date(Date.now() - 60 * 60 * 1000) } } });
}

/**
 * Marks a link used, exactly once: the conditional update means two simultaneous uses cannot
 * both succeed. Unknown, used and expired links each get a message naming `body.token`.
 */
export async function consumeToken(token: string, purpose: TokenPurpose, transaction?: Transaction): Promise<AccountToken> {
  const row = await AccountToken.findOne({ where: { tokenHash: hashToken(token), purpose }, transaction });
  if (!row) throw linkError(400, 'validation_failed', 'This link is not valid; ask for a new one');
  if (row.usedAt) throw linkError(410, 'gone', 'This link was already used or replaced by a newer one; ask for a new one');
  if (row.expiresAt.getTime() < Date.now()) throw linkError(410, 'gone', 'This link has expired; ask for a new one');
  const [changed] = await AccountToken.update({ usedAt: new Date() }, { where: { id: row.id, usedAt: null }, transaction });
  if (changed !== 1) throw linkError(410, 'gone', 'This link was already used; ask for a new one');
  return row;
}

export const linkError = (status: number, code: 'validation_failed' | 'gone', message: string) => new HttpError(status, code, message, [{ path: 'body.token', message }]);

export async function setPassword(userId: number, password: string, options: { verifyEmail: boolean }, transaction?: Transaction): Promise<void> {
  const passwordHash = await hashPassword(password);
  await User.update({ passwordHash, ...(options.verifyEmail ? { emailVerified: true } : {}) }, { where: { id: userId }, transaction });
}

/** Ends the user's sessions (except one, when given): after a password change nobody else stays signed in. */
export async function endSessions(userId: number, exceptSid?: string): Promise<void> {
  const Session = User.sequelize!.models.Session;
  await Session.destroy({ where: { userId, ...(exceptSid ? { sid: { [Op.ne]: exceptSid } } : {}) } });
}

export async function findUserWithPassword(userId: number): Promise<User> {
  const user = await User.scope('withPassword').findByPk(userId);
  if (!user) throw new HttpError(401, 'unauthenticated', 'Please sign in');
  return user;
}

export async function emailTaken(email: string, exceptUserId?: number): Promise<boolean> {
  const user = await User.findOne({ where: { email: normalizeEmail(email) }, attributes: ['id'] });
  return Boolean(user && user.id !== exceptUserId);
}

export async function firstWorkspaceName(userId: number): Promise<string | null> {
  return (await listUserWorkspaces(userId))[0]?.name ?? null;
}

// ---------------------------------------------------------------- account changes the auth routes make

export async function findUserByEmail(email: string): Promise<User | null> {
  return User.findOne({ where: { email: normalizeEmail(email) } });
}

/**
 * Uses a password-reset link and sets the new password in one transaction, so a link that fails
 * half-way stays unused. Following the e-mailed link shows the address is theirs. The account
 * signs in afterwards; 410 naming body.token when it was deleted meanwhile.
 */
export async function resetPasswordWithToken(token: string, password: string): Promise<Express.User> {
  const used = await User.sequelize!.transaction(async (transaction) => {
    const row = await consumeToken(token, 'password-reset', transaction);
    await setPassword(row.userId, password, { verifyEmail: true }, transaction);
    return row;
  });
  await endSessions(used.userId);
  const user = await User.findByPk(used.userId);
  if (!user) throw new HttpError(410, 'gone', 'This account no longer exists', [{ path: 'body.token', message: 'The account was deleted' }]);
  return { id: user.id, email: user.email, displayName: user.displayName };
}

/** Uses a confirm-email link: the address it carries (a change) or the account's own becomes the verified one. */
export async function confirmEmailWithToken(token: string): Promise<string> {
  return User.sequelize!.transaction(async (transaction) => {
    const used = await consumeToken(token, 'confirm-email', transaction);
    const user = await User.findByPk(used.userId, { transaction });
    if (!user) throw new HttpError(410, 'gone', 'This account no longer exists', [{ path: 'body.token', message: 'The account was deleted' }]);
    const next = used.email ?? user.email;
    if (next !== user.email && (await emailTaken(next, user.id))) {
      throw new HttpError(409, 'conflict', 'Another account uses this address now', [{ path: 'body.token', message: 'Another account uses this address now' }]);
    }
    await user.update({ email: next, emailVerified: true }, { transaction });
    return next;
  });
}

export async function setDisplayName(userId: number, displayName: string): Promise<void> {
  await User.update({ displayName }, { where: { id: userId } });
}
