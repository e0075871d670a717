import { Op } from 'sequelize';
import { User, type Workspace } from '../db/models';
import { HttpError } from '../http/errors';
import { SignUpRequest } from './models';
import { checkPassword, hashPassword } from './passwords';
import { createWorkspaceFor, normalizeEmail } from './service';
import { hashToken, newToken } from './tokens';

/** How long the e-mailed link to finish signing up works. */
export const SIGN_UP_VALID_MS = 24 * 60 * 60 * 1000;
/** Sign-up mail one inbox gets in an hour, of either kind: nobody can flood an address by signing up with it. */
export const SIGN_UP_MAILS_PER_HOUR = 5;
// Expired rows stay a week, so an old link still says "expired" rather than "not valid".
const KEEP_EXPIRED_MS = 7 * 24 * 60 * 60 * 1000;
const HOUR = 60 * 60 * 1000;

export interface SignUpInput {
  displayName: string;
  email: string;
  password: string;
  workspaceName: string;
  timeZone?: string;
}

/** What a sign-up request became; the HTTP answer is the same for both kinds. */
export type SignUpRequested =
  | { kind: 'new'; requestId: number; email: string; token: string; mail: boolean }
  | { kind: 'existing'; requestId: number; email: string; user: User; mail: boolean };

/**
 * Keeps a sign-up until its link is opened. Both kinds do the same work in the same order (the
 * bcrypt hash, the account lookup, the count, one insert), so the time taken does not say whether
 * the address has an account; for a taken address the typed details are not kept.
 */
export async function requestSignUp(input: SignUpInput): Promise<SignUpRequested> {
  const email = normalizeEmail(input.email);
  const passwordHash = await hashPassword(input.password);
  const existing = await User.scope('withPassword').findOne({ where: { email }, attributes: ['id', 'email', 'displayName', 'googleId', 'passwordHash'] });
  const recent = await SignUpRequest.count({ where: { email, createdAt: { [Op.gte]: new Date(Date.now() - HOUR) } } });
  const { token, hash } = newToken();
  const row = await SignUpRequest.create({
    email,
    tokenHash: hash,
    existingUserId: existing?.id ?? null,
    displayName: existing ? null : input.displayName,
    workspaceName: existing ? null : input.workspaceName,
    timeZone: existing ? null : (input.timeZone ?? null),
    passwordHash: existing ? null : passwordHash,
    expiresAt: new Date(Date.now() + SIGN_UP_VALID_MS),
  });
  await SignUpRequest.destroy({ where: { expiresAt: { [Op.lt]: new Date(Date.now() - KEEP_EXPIRED_MS) } } });
  const mail = recent < SIGN_UP_MAILS_PER_HOUR;
  return existing ? { kind: 'existing', requestId: row.id, email, user: existing, mail } : { kind: 'new', requestId: row.id, email, token, mail };
}

const linkProblem = (status: number, code: 'validation_failed' | 'gone' | 'conflict', message: string, field: string) => new HttpError(status, code, message, [{ path: field, message }]);

/**
 * The waiting sign-up a link names, if it can still be finished. Unknown links, links of a taken
 * address (never sent), used and expired links, and addresses that got an account meanwhile
 * (an invitation, Google, another link) each get their own words, naming `field`.
 */
export async function findOpenSignUp(token: string, field: string): Promise<SignUpRequest> {
  const row = await SignUpRequest.findOne({ where: { tokenHash: hashToken(token) } });
  if (!row || row.existingUserId !== null || !row.displayName || !row.workspaceName) {
    throw linkProblem(400, 'validation_failed', 'This link is not valid. Sign up again to get a new one.', field);
  }
  if (row.usedAt) throw linkProblem(410, 'gone', 'This link was already used: the account is made. Sign in with its e-mail address and password.', field);
  if (row.expiresAt.getTime() < Date.now()) throw linkProblem(410, 'gone', 'This link has expired (it works for 24 hours). Sign up again to get a new one.', field);
  if (await User.findOne({ where: { email: row.email }, attributes: ['id'] })) {
    throw linkProblem(409, 'conflict', 'An account for this address was made in the meantime. Sign in instead.', field);
  }
  return row;
}

/**
 * Makes the account and its workspace from a waiting sign-up, once. Opened in the browser that
 * signed up, the link is enough; anywhere else the password chosen then is asked for too, since
 * whoever typed the address need not own it: without this, someone could sign up with another
 * person's address and, once that person followed the link, know the password of their account.
 */
export async function finishSignUp(
  token: string,
  password: string | undefined,
  sameBrowser: (requestId: number) => boolean,
): Promise<{ user: Express.User; workspace: Workspace }> {
  const row = await findOpenSignUp(token, 'body.token');
  if (!sameBrowser(row.id)) {
    if (!password) throw linkProblem(400, 'validation_failed', 'Enter the password you chose when you signed up', 'body.password');
    if (!(await checkPassword(password, row.passwordHash))) throw linkProblem(400, 'validation_failed', 'This is not the password chosen when signing up', 'body.password');
  }
  const sequelize = SignUpRequest.sequelize!;
  try {
    return await sequelize.transaction(async (transaction) => {
      // Conditional on still being unused: two simultaneous uses of one link cannot both succeed.
      const [changed] = await SignUpRequest.update({ usedAt: new Date() }, { where: { id: row.id, usedAt: null }, transaction });
      if (changed !== 1) throw linkProblem(410, 'gone', 'This link was already used: the account is made. Sign in with its e-mail address and password.', 'body.token');
      // Following the e-mailed link shows the address is theirs.
      const user = await User.create({ email: row.email, displayName: row.displayName!, passwordHash: row.passwordHash, emailVerified: true }, { transaction });
      const workspace = await createWorkspaceFor(user.id, row.workspaceName!, row.timeZone ?? undefined, transaction);
      // The account keeps the password hash; the request needs it no more.
      await SignUpRequest.update({ userId: user.id, passwordHash: null }, { where: { id: row.id }, transaction });
      return { user: { id: user.id, email: user.email, displayName: user.displayName }, workspace };
    });
  } catch (err) {
    if ((err as { name?: string }).name === 'SequelizeUniqueConstraintError') {
      throw linkProblem(409, 'conflict', 'An account for this address was made in the meantime. Sign in instead.', 'body.token');
    }
    throw err;
  }
}
