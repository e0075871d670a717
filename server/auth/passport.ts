import passportModule from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import { Strategy as GoogleStrategy, type Profile, type VerifyCallback } from 'passport-google-oauth20';
import type { Request } from 'express';
import type { Env } from '../env';
import { verifyPassword, googleSignIn, loadSignedInUser, type GoogleIdentity } from './service';
import { preloadedAccount, rememberAccount } from './load-context';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    /** The signed-in account as passport puts it on req.user (never with its password hash). */
    interface User {
      id: number;
      email: string;
      displayName: string;
    }
  }
}

export type Authenticator = InstanceType<typeof passportModule.Passport>;

/** A passport instance per app (tests build many apps), with the password and, if configured, Google strategies. */
export function createPassport(env: Env): Authenticator {
  const passport = new passportModule.Passport();
  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password', session: true }, (email, password, done) => {
      verifyPassword(email, password).then(
        (user) => done(null, user ?? false),
        (err) => done(err),
      );
    }),
  );
  if (env.google) {
    passport.use(
      new GoogleStrategy(
        {
          clientID: env.google.clientId,
          clientSecret: env.google.clientSecret,
          // Relative: passport-oauth2 resolves it against the request, so any host and port work.
          callbackURL: '/api/auth/google/callback',
          authorizationURL: env.google.authUrl,
          tokenURL: env.google.tokenUrl,
          userProfileURL: env.google.profileUrl,
          scope: ['openid', 'profile', 'email'],
          // A nonce in the session ties the callback to the browser that started the sign-in.
          state: true,
          passReqToCallback: true as const,
        },
        (req: Request, _accessToken: string, _refreshToken: string, profile: Profile, done: VerifyCallback) => {
          const email = profile.emails?.[0];
          const identity: GoogleIdentity = {
            googleId: profile.id,
            displayName: profile.displayName || email?.value || 'Google user',
            email: email?.value ?? null,
            // passport-google-oauth20 passes Google's email_verified through (boolean or the string "true").
            emailVerified: String(email?.verified) === 'true',
          };
          const joiningByInvitation = Boolean(req.session.returnTo?.startsWith('/invitation'));
          googleSignIn(identity, { createWorkspace: !joiningByInvitation }).then(
            (result) => (result.ok ? done(null, result.user) : done(null, false, { message: result.message })),
            (err) => done(err),
          );
        },
      ),
    );
  }
  passport.serializeUser((user, done) => done(null, user.id));
  passport.deserializeUser((req: Request, id: number, done: (err: unknown, user?: Express.User | false) => void) => {
    const preloaded = preloadedAccount(req, id);
    (preloaded ? Promise.resolve(preloaded) : loadSignedInUser(id, req.session.workspaceId)).then(
      (found) => {
        // A deleted user simply becomes signed out.
        if (!found) return done(null, false);
        rememberAccount(req, found);
        done(null, found.user);
      },
      (err) => done(err),
    );
  });
  return passport;
}
