import session from 'express-session';
import connectSessionSequelize from 'connect-session-sequelize';
import type { Request, RequestHandler } from 'express';
import { loadSessionWithAccount, type SignedInAccount } from './service';
import { rememberAccount } from './load-context';
import { SessionCache } from './session-cache';
import type { Sequelize } from 'sequelize';
import type { Env } from '../env';
import { initAccountModels } from './models';

declare module 'express-session' {
  interface SessionData {
    /** The workspace the user last chose; checked against memberships on every request. */
    workspaceId?: number;
    /** Where to go after Google sign-in (a path on our own site only). */
    returnTo?: string;
    passport?: { user?: number };
  }
}

export const SESSION_COOKIE = 'rotaloom.sid';
const TWO_WEEKS = 14 * 24 * 60 * 60 * 1000;

const SequelizeStore = connectSessionSequelize(session.Store);
const ACCOUNT = Symbol('account read with the session');
const READ_ONLY_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

export interface SessionHandle {
  middleware: RequestHandler;
  store: session.Store;
}

/** Sessions in MariaDB; the cookie is httpOnly, SameSite=Lax and Secure whenever the request came over HTTPS. */
export function createSessionMiddleware(env: Env, sequelize: Sequelize): SessionHandle {
  initAccountModels(sequelize);
  const store = new SequelizeStore({
    db: sequelize,
    table: 'Session',
    expiration: TWO_WEEKS,
    // Tests build many apps; a timer per store would keep them alive, and the index on `expires` keeps lookups cheap anyway.
    checkExpirationInterval: env.nodeEnv === 'test' ? 0 : 15 * 60 * 1000,
    // Kept beside the data so all of a user's sessions can be ended after a password reset.
    extendDefaultFields: (defaults: { data: string; expires: Date }, data: { passport?: { user?: number } }) => ({
      ...defaults,
      userId: data.passport?.user ?? null,
    }),
  });
  // Read on every request: one plain SELECT that also brings the account (see
  // loadSessionWithAccount), and an expired row counts as no session even before the periodic
  // cleanup removes it; a burst of reads of one session within a second shares it (SessionCache).
  // The account rides on the parsed session under a symbol (not saved, not hashed) until
  // createSession, which has the request, hands it to deserializeUser.
  const recent = new SessionCache();
  const answer = (row: { data: string; account: SignedInAccount | null }) => {
    const data = JSON.parse(row.data) as session.SessionData;
    if (row.account) Object.defineProperty(data, ACCOUNT, { value: row.account, enumerable: false });
    return data;
  };
  store.get = (sid: string, callback: (err: unknown, session?: session.SessionData | null) => void) => {
    const hit = recent.get(sid);
    if (hit) return callback(null, answer(hit));
    loadSessionWithAccount(sid).then((row) => {
      if (!row) return callback(null, null);
      recent.remember(sid, row);
      callback(null, answer(row));
    }, callback);
  };
  for (const write of ['set', 'destroy', 'touch'] as const) {
    const original = store[write].bind(store) as (sid: string, ...rest: unknown[]) => unknown;
    (store as unknown as Record<string, unknown>)[write] = (sid: string, ...rest: unknown[]) => {
      recent.forget(sid);
      return original(sid, ...rest);
    };
  }
  const createSession = store.createSession.bind(store);
  store.createSession = (req, data) => {
    const account = (data as { [ACCOUNT]?: SignedInAccount })[ACCOUNT];
    if (account) rememberAccount(req as unknown as Request, account);
    return createSession(req, data);
  };
  // Rolling sessions would otherwise write the sessions table on every read; once a minute per
  // session is plenty to keep a two-week expiry moving.
  const touch = store.touch.bind(store);
  const lastTouch = new Map<string, number>();
  store.touch = (sid: string, data: session.SessionData, callback?: (err?: unknown) => void) => {
    const now = Date.now();
    if (now - (lastTouch.get(sid) ?? 0) < 60_000) return callback?.();
    if (lastTouch.size > 50_000) lastTouch.clear();
    lastTouch.set(sid, now);
    touch(sid, data, callback);
  };
  const sessions = session({
    name: SESSION_COOKIE,
    secret: env.sessionSecret,
    store,
    resave: false,
    saveUninitialized: false,
    rolling: true,
    proxy: true,
    cookie: {
      httpOnly: true,
      sameSite: 'lax',
      // 'auto' follows req.secure (trust proxy is set for loopback); a public https URL forces it.
      secure: env.publicUrl.startsWith('https:') ? true : 'auto',
      maxAge: TWO_WEEKS,
      path: '/',
    },
  });
  // Every state-changing request may change sessions, accounts or memberships: the cache is
  // cleared as it starts and again once its writes are done.
  const middleware: RequestHandler = (req, res, next) => {
    if (!READ_ONLY_METHODS.has(req.method)) {
      recent.clear();
      res.once('close', () => recent.clear());
    }
    sessions(req, res, next);
  };
  return { middleware, store };
}
