import session from 'express-session';
import connectSessionSequelize from 'connect-session-sequelize';
import type { Request, RequestHandler } from 'express';
import { loadSessionWithAccount, type SignedInAccount } from './service';
import { rememberAccount } from './load-context';
import { SessionCache } from './session-cache';
import type { Model, ModelStatic, Sequelize } from 'sequelize';
import type { Env } from '../env';
import { initAccountModels } from './models';

declare module 'express-session' {
  interface SessionData {
    /** The workspace the user last chose; checked against memberships on every request. */
    workspaceId?: number;
    /** Where to go after Google sign-in (a path on our own site only). */
    returnTo?: string;
    passport?: { user?: number };
    /** Sign-ups asked for in this browser (the last five): their links finish here without the password again. */
    signUpRequests?: number[];
  }
}

export const SESSION_COOKIE = 'rotaloom.sid';
const TWO_WEEKS = 14 * 24 * 60 * 60 * 1000;

/**
 * However active, a session ends this long after sign-in (the row is made at sign-in, since each
 * sign-in gets a new session id): a cookie taken once cannot be kept alive for ever by using it.
 */
export const SESSION_LIFETIME_MS = 30 * 24 * 60 * 60 * 1000;

const SequelizeStore = connectSessionSequelize(session.Store);
/** Sessions read from the store (as opposed to made on this request). */
const loaded = new WeakSet<object>();
const ACCOUNT = Symbol('account read with the session');
const READ_ONLY_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

export interface SessionHandle {
  middleware: RequestHandler;
  store: session.Store;
}

type Callback = (err?: unknown) => void;

/**
 * The Sequelize store, read the way every request needs it:
 * - get: one plain SELECT that also brings the account (loadSessionWithAccount); an expired row
 *   counts as no session even before the periodic cleanup removes it; reads of one session within
 *   a second share it (SessionCache, cleared by writes and by state-changing requests);
 * - createSession, which has the request, hands the account (carried on the parsed session under
 *   a symbol: not saved, not hashed) to deserializeUser;
 * - touch: rolling sessions would otherwise write the table on every read; once a minute per
 *   session keeps a two-week expiry moving.
 */
class RotaloomStore extends SequelizeStore {
  readonly recent = new SessionCache();
  private readonly lastTouch = new Map<string, number>();

  get(sid: string, callback: (err: unknown, session?: session.SessionData | null) => void): void {
    const hit = this.recent.get(sid);
    if (hit) return callback(null, withAccount(hit));
    const mark = this.recent.mark();
    loadSessionWithAccount(sid, SESSION_LIFETIME_MS).then((row) => {
      if (!row) return callback(null, null);
      this.recent.remember(sid, row, mark);
      callback(null, withAccount(row));
    }, callback);
  }

  /**
   * The library's set is find-or-create: a request that read the session just before sign-out
   * and changed it afterwards would bring the signed-out row back to life. A session read from the
   * store is only ever updated; only a new one (sign-in, first visit) is created.
   */
  set(sid: string, data: session.SessionData, callback?: Callback) {
    this.recent.forget(sid);
    if (!loaded.has(data)) return super.set(sid, data, callback);
    const expires = data.cookie?.expires ? new Date(data.cookie.expires) : new Date(Date.now() + TWO_WEEKS);
    const model = (this as unknown as { sessionModel: ModelStatic<Model> }).sessionModel;
    model.update({ data: JSON.stringify(data), expires, userId: data.passport?.user ?? null }, { where: { sid } }).then(() => callback?.(), callback);
  }

  destroy(sid: string, callback?: Callback) {
    this.recent.forget(sid);
    return super.destroy(sid, callback);
  }

  // a property in the store's typings, a prototype method at run time
  touch = (sid: string, data: session.SessionData, callback?: Callback): void => {
    const now = Date.now();
    if (now - (this.lastTouch.get(sid) ?? 0) < 60_000) return void callback?.();
    if (this.lastTouch.size > 50_000) this.lastTouch.clear();
    this.lastTouch.set(sid, now);
    SequelizeStore.prototype.touch.call(this, sid, data, callback);
  };

  createSession(req: Request, data: session.SessionData) {
    const account = (data as { [ACCOUNT]?: SignedInAccount })[ACCOUNT];
    if (account) rememberAccount(req, account);
    const created = super.createSession(req, data);
    loaded.add(created);
    return created;
  }
}

const withAccount = (row: { data: string; account: SignedInAccount | null }): session.SessionData => {
  const data = JSON.parse(row.data) as session.SessionData;
  if (row.account) Object.defineProperty(data, ACCOUNT, { value: row.account, enumerable: false });
  return data;
};

/** Sessions in MariaDB; the cookie is httpOnly, SameSite=Lax and Secure whenever the request came over HTTPS. */
export function createSessionMiddleware(env: Env, sequelize: Sequelize): SessionHandle {
  initAccountModels(sequelize);
  const store = new RotaloomStore({
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
      store.recent.clear();
      res.once('close', () => store.recent.clear());
    }
    sessions(req, res, next);
  };
  return { middleware, store };
}
