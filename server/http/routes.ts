import { Router, type RequestHandler } from 'express';
import type { Role } from '../db/models';
import { HttpError } from './errors';
import '../auth/context';
import type {} from 'passport';

/** Who may call a route: anyone, any signed-in user (no workspace needed), or members with one of these roles. */
export type Access = 'public' | 'signed-in' | readonly Role[];

export interface RouteSpec {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  path: string;
  access: Access;
}

/**
 * Every API route, as declared. The role-by-route matrix test walks this table, so a route added
 * anywhere is checked without anyone remembering to list it.
 */
export const routeTable: RouteSpec[] = [];

export const STAFF_UP: readonly Role[] = ['admin', 'coordinator', 'staff'];
export const COORDINATOR_UP: readonly Role[] = ['admin', 'coordinator'];
export const ADMIN_ONLY: readonly Role[] = ['admin'];

export function guard(access: Access): RequestHandler {
  return (req, _res, next) => {
    if (access === 'public') return next();
    const signedIn = typeof req.isAuthenticated === 'function' ? req.isAuthenticated() : Boolean(req.auth);
    if (!signedIn) return next(new HttpError(401, 'unauthenticated', 'Please sign in'));
    if (access === 'signed-in') return next();
    if (!req.auth) return next(new HttpError(403, 'forbidden', 'You are not a member of a workspace'));
    if (!access.includes(req.auth.role)) return next(new HttpError(403, 'forbidden', `This needs the ${access.join(' or ')} role`));
    next();
  };
}

/** A router that records each route it defines in `routeTable` and puts its guard first. */
export class ApiRoutes {
  readonly router = Router();
  constructor(readonly base: string) {}

  private add(method: RouteSpec['method'], path: string, access: Access, handlers: RequestHandler[]): this {
    const fullPath = `/api${this.base}${path === '/' ? '' : path}`;
    // Apps are built more than once in tests; the table keeps one row per route.
    if (!routeTable.some((r) => r.method === method && r.path === fullPath)) routeTable.push({ method, path: fullPath, access });
    this.router[method](path, guard(access), ...handlers);
    return this;
  }
  get(path: string, access: Access, ...h: RequestHandler[]) { return this.add('get', path, access, h); }
  post(path: string, access: Access, ...h: RequestHandler[]) { return this.add('post', path, access, h); }
  put(path: string, access: Access, ...h: RequestHandler[]) { return this.add('put', path, access, h); }
  patch(path: string, access: Access, ...h: RequestHandler[]) { return this.add('patch', path, access, h); }
  delete(path: string, access: Access, ...h: RequestHandler[]) { return this.add('delete', path, access, h); }
}

/** Express 5 passes rejected promises to next(); this only narrows the handler's type for readability. */
export const handle = (fn: (...args: Parameters<RequestHandler>) => Promise<unknown>): RequestHandler => fn as RequestHandler;
