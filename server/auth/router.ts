import type { Request, Response, NextFunction, Router } from 'express';
import type { Sequelize } from 'sequelize';
import type { Env } from '../env';
import type { User } from '../db/models';
import { ApiRoutes } from '../http/routes';
import { sharedRateLimit } from '../http/rate-limit';
import { HttpError } from '../http/errors';
import { validate } from '../http/validate';
import type { Mailer } from '../mail/mailer';
import { confirmEmailMail, finishSignUpMail, passwordChangedMail, passwordResetMail, signUpAttemptMail } from '../mail/templates';
import {
  changeEmailSchema,
  changePasswordSchema,
  confirmEmailSchema,
  finishSignUpSchema,
  forgotPasswordSchema,
  resetPasswordSchema,
  signInSchema,
  signUpPreviewQuerySchema,
  signUpSchema,
  updateProfileSchema,
} from '../../shared/auth/schemas';
import type { Authenticator } from './passport';
import { SESSION_COOKIE } from './session';
import { checkPassword } from './passwords';
import { reserveSignIn, settleSignIn } from './lockout';
import { requireStrongPassword } from './strength';
import {
  CONFIRM_VALID_MS,
  RESET_VALID_MS,
  confirmEmailWithToken,
  emailTaken,
  endSessions,
  findUserByEmail,
  findUserWithPassword,
  firstWorkspaceName,
  issueToken,
  normalizeEmail,
  recentTokenCount,
  resetPasswordWithToken,
  resolveMembership,
  sessionView,
  setDisplayName,
  setPassword,
} from './service';
import { SIGN_UP_VALID_MS, findOpenSignUp, finishSignUp, requestSignUp } from './sign-up';

export interface AuthDeps {
  env: Env;
  passport: Authenticator;
  mailer: Mailer;
  /** Where the per-address limits are counted (server/http/rate-limit.ts). */
  sequelize: Sequelize;
}

/** Signs the user in on this request (a fresh session id) and picks their workspace, preferring `workspaceId`. */
export async function logIn(req: Request, user: Express.User, workspaceId?: number): Promise<void> {
  await new Promise<void>((resolve, reject) => req.login(user, (err) => (err ? reject(err) : resolve())));
  const membership = await resolveMembership(user.id, workspaceId);
  if (membership) {
    req.session.workspaceId = membership.workspaceId;
    req.auth = { userId: user.id, ...membership };
  }
}

/** The session as GET /api/auth/session returns it, for the request's user and workspace. */
export async function currentSession(req: Request) {
  if (!req.user) throw new HttpError(401, 'unauthenticated', 'Please sign in');
  return sessionView(req.user.id, req.auth?.workspaceId ?? null, req.auth?.personId ?? null);
}

/** Mail goes out after the answer, so a known and an unknown address take the same time; failures are logged without the link. */
export function sendLater(mailer: Mailer, mail: Parameters<Mailer['send']>[0], what: string): void {
  mailer.send(mail).catch((err: unknown) => console.error(`Could not send the ${what} e-mail: ${err instanceof Error ? err.message : String(err)}`));
}

/** Only paths on our own site: an open redirect would let a link send people anywhere after signing in. */
export const safeReturnTo = (value: unknown): string | undefined =>
  typeof value === 'string' && /^\/(?![/\\])[^\s]*$/.test(value) && value.length <= 500 ? value : undefined;

const SAME_MESSAGE = 'The e-mail address or the password is not right';

export function authRouter({ env, passport, mailer, sequelize }: AuthDeps): Router {
  const routes = new ApiRoutes('/auth');
  // Sign-up and password-reset requests per address, on top of the per-account sign-in limits;
  // counted in Redis, so a client cannot multiply its allowance by reaching several API processes.
  const perAddress = sharedRateLimit(sequelize, 'account-requests', {
    windowMs: 15 * 60 * 1000,
    limit: env.accountRequestsPerAddress,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (_req, _res, next) => next(new HttpError(429, 'rate_limited', 'Too many requests from this address; try again in a few minutes')),
  });

  // Public, and 200 with { user: null } when signed out: the front page asks on every visit and a
  // 401 there would show up as a failed request in every browser console.
  routes.get('/session', 'public', async (req, res) => {
    if (!req.isAuthenticated()) return void res.json({ user: null });
    res.json(await currentSession(req));
  });

  routes.get('/providers', 'public', (_req, res) => {
    res.json({ password: true, google: Boolean(env.google) });
  });

  routes.post('/sign-in', 'public', validate({ body: signInSchema }), async (req, res, next) => {
    const email = normalizeEmail((req.body as { email: string }).email);
    const reserved = await reserveSignIn(email, req.ip ?? 'unknown', env.signInLimits);
    if (!reserved.ok) {
      res.set('Retry-After', String(reserved.retryAfter));
      const minutes = Math.ceil(reserved.retryAfter / 60);
      throw new HttpError(429, 'rate_limited', `Too many failed sign-ins; try again in ${minutes} minute${minutes === 1 ? '' : 's'}`, [
        { path: 'body.email', message: 'Too many failed sign-ins for now' },
      ]);
    }
    const user = await new Promise<Express.User | false>((resolve, reject) => {
      passport.authenticate('local', { session: false }, (err: unknown, found: Express.User | false) => (err ? reject(err) : resolve(found)))(req, res, next);
    });
    await settleSignIn(reserved.reservation, Boolean(user));
    // One message whether the address is unknown or the password wrong, so sign-in reveals no accounts.
    if (!user) throw new HttpError(401, 'unauthenticated', SAME_MESSAGE, [{ path: 'body.password', message: SAME_MESSAGE }]);
    await logIn(req, user);
    res.json(await currentSession(req));
  });

  // Sign-up waits for the e-mailed link and answers the same whether or not the address has an
  // account (issue 13 item 6): a new address gets the link, a taken one a note to its owner.
  routes.post('/sign-up', 'public', perAddress, validate({ body: signUpSchema }), async (req, res) => {
    await requireStrongPassword(req.body.password, 'body.password', [req.body.email, req.body.displayName, req.body.workspaceName]);
    const requested = await requestSignUp(req.body);
    // Remembered for both kinds, so the answer (its cookie too) is the same; lets this browser finish without the password again.
    req.session.signUpRequests = [...(req.session.signUpRequests ?? []).slice(-4), requested.requestId];
    res.status(202).json({
      email: requested.email,
      message: `Check your e-mail to finish signing up. We sent a message to ${requested.email}; its link works once, within ${SIGN_UP_VALID_MS / 3_600_000} hours.`,
    });
    if (!requested.mail) return;
    if (requested.kind === 'new') {
      const { displayName, workspaceName } = req.body as { displayName: string; workspaceName: string };
      sendLater(mailer, finishSignUpMail({ to: requested.email, displayName, workspaceName, url: `${env.publicUrl}/finish-sign-up?token=${requested.token}`, validForMs: SIGN_UP_VALID_MS }), 'finish sign-up');
    } else {
      const owner = requested.user;
      firstWorkspaceName(owner.id).then(
        (workspaceName) =>
          sendLater(mailer, signUpAttemptMail({ to: owner.email, displayName: owner.displayName, workspaceName, hasPassword: Boolean(owner.passwordHash), hasGoogle: Boolean(owner.googleId), signInUrl: `${env.publicUrl}/`, resetUrl: `${env.publicUrl}/forgot-password` }), 'sign-up attempt'),
        (err: unknown) => console.error(`Could not send the sign-up attempt e-mail: ${err instanceof Error ? err.message : String(err)}`),
      );
    }
  });

  const inThisBrowser = (req: Request) => (requestId: number) => (req.session.signUpRequests ?? []).includes(requestId);

  routes.get('/sign-up/preview', 'public', validate({ query: signUpPreviewQuerySchema }), async (req, res) => {
    const row = await findOpenSignUp((req.query as unknown as { token: string }).token, 'query.token');
    res.json({ email: row.email, displayName: row.displayName, workspaceName: row.workspaceName, passwordNeeded: !inThisBrowser(req)(row.id) });
  });

  routes.post('/sign-up/finish', 'public', perAddress, validate({ body: finishSignUpSchema }), async (req, res) => {
    const { user, workspace } = await finishSignUp(req.body.token, req.body.password, inThisBrowser(req));
    await logIn(req, user, workspace.id);
    res.status(201).json(await currentSession(req));
  });

  routes.post('/sign-out', 'public', async (req, res) => {
    if (req.session) await new Promise<void>((resolve, reject) => req.session.destroy((err) => (err ? reject(err) : resolve())));
    res.clearCookie(SESSION_COOKIE, { path: '/', httpOnly: true, sameSite: 'lax' });
    res.status(204).end();
  });

  routes.post('/forgot-password', 'public', perAddress, validate({ body: forgotPasswordSchema }), async (req, res) => {
    const user = await findUserByEmail(req.body.email);
    // At most three links an hour to one inbox; the answer is the same either way.
    if (user && (await recentTokenCount(user.id, 'password-reset')) < 3) {
      const token = await issueToken(user.id, 'password-reset', RESET_VALID_MS);
      const workspaceName = await firstWorkspaceName(user.id);
      sendLater(mailer, passwordResetMail({ to: user.email, displayName: user.displayName, workspaceName, url: `${env.publicUrl}/reset-password?token=${token}`, validForMs: RESET_VALID_MS }), 'password reset');
    }
    res.status(202).json({ message: 'If an account uses this address, a link to choose a new password is on its way. It works for one hour.' });
  });

  routes.post('/reset-password', 'public', perAddress, validate({ body: resetPasswordSchema }), async (req, res) => {
    const { token, password } = req.body as { token: string; password: string };
    await requireStrongPassword(password, 'body.password');
    const user = await resetPasswordWithToken(token, password);
    await logIn(req, user);
    res.json(await currentSession(req));
  });

  routes.post('/confirm-email', 'public', validate({ body: confirmEmailSchema }), async (req, res) => {
    const email = await confirmEmailWithToken(req.body.token);
    res.json({ email, emailVerified: true });
  });

  routes.patch('/profile', 'signed-in', validate({ body: updateProfileSchema }), async (req, res) => {
    await setDisplayName(req.user!.id, req.body.displayName);
    res.json(await currentSession(req));
  });

  /** A password account must prove it knows the current password; a Google-only account may set its first one. */
  async function requireCurrentPassword(userId: number, given: string | undefined, field: string): Promise<User> {
    const user = await findUserWithPassword(userId);
    if (user.passwordHash && !(await checkPassword(given ?? '', user.passwordHash))) {
      throw new HttpError(400, 'validation_failed', 'This is not your current password', [{ path: field, message: 'This is not your current password' }]);
    }
    return user;
  }

  routes.post('/change-password', 'signed-in', validate({ body: changePasswordSchema }), async (req, res) => {
    const user = await requireCurrentPassword(req.user!.id, req.body.currentPassword, 'body.currentPassword');
    await requireStrongPassword(req.body.newPassword, 'body.newPassword', [user.email, user.displayName]);
    await setPassword(user.id, req.body.newPassword, { verifyEmail: false });
    await endSessions(user.id, req.sessionID);
    sendLater(mailer, passwordChangedMail({ to: user.email, displayName: user.displayName, workspaceName: await firstWorkspaceName(user.id) }), 'password changed');
    res.json(await currentSession(req));
  });

  routes.post('/change-email', 'signed-in', validate({ body: changeEmailSchema }), async (req, res) => {
    const user = await requireCurrentPassword(req.user!.id, req.body.currentPassword, 'body.currentPassword');
    const email = normalizeEmail(req.body.email);
    if (email === user.email) throw new HttpError(400, 'validation_failed', 'This is already your address', [{ path: 'body.email', message: 'This is already your address' }]);
    if (await emailTaken(email, user.id)) throw new HttpError(409, 'conflict', 'Another account uses this address', [{ path: 'body.email', message: 'Another account uses this address' }]);
    const token = await issueToken(user.id, 'confirm-email', CONFIRM_VALID_MS, email);
    sendLater(mailer, confirmEmailMail({ to: email, displayName: user.displayName, workspaceName: await firstWorkspaceName(user.id), url: `${env.publicUrl}/confirm-email?token=${token}`, validForMs: CONFIRM_VALID_MS, change: true }), 'address change');
    res.status(202).json({ pendingEmail: email, message: `We sent a link to ${email}; your address changes once you open it.` });
  });

  // Google sign-in: a redirect to Google (or the local fake) and back.
  routes.get('/google', 'public', (req: Request, res: Response, next: NextFunction) => {
    if (!env.google) throw new HttpError(404, 'not_found', 'Google sign-in is not set up on this server');
    const returnTo = safeReturnTo(req.query.returnTo);
    if (returnTo) req.session.returnTo = returnTo;
    else delete req.session.returnTo;
    passport.authenticate('google', { session: false, prompt: 'select_account' })(req, res, next);
  });

  routes.get('/google/callback', 'public', (req: Request, res: Response, next: NextFunction) => {
    if (!env.google) throw new HttpError(404, 'not_found', 'Google sign-in is not set up on this server');
    const returnTo = req.session.returnTo ?? '/';
    passport.authenticate('google', { session: false }, (err: unknown, user: Express.User | false, info: { message?: string } | undefined) => {
      if (err) {
        // Usually the provider refusing the code (expired, replayed); the person can simply try again.
        console.error(`Google sign-in failed: ${err instanceof Error ? `${err.name} ${err.message}` : String(err)}`);
        return res.redirect(`/?signInError=${encodeURIComponent('Google sign-in did not work; please try again')}`);
      }
      if (!user) {
        const message = req.query.error === 'access_denied' ? 'Google sign-in was cancelled' : (info?.message ?? 'Google sign-in did not work; please try again');
        return res.redirect(`/?signInError=${encodeURIComponent(message)}`);
      }
      logIn(req, user).then(() => {
        res.redirect(returnTo);
      }, next);
    })(req, res, next);
  });

  return routes.router;
}
