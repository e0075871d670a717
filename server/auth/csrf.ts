import type { RequestHandler } from 'express';
import { HttpError } from '../http/errors';

/** The header every state-changing API call must carry (hooks/api/api-client.ts sends it). */
export const CSRF_HEADER = 'x-rotaloom-csrf';

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

/** Called by other services, never by a browser with our cookie: trusted through their own signature instead. */
export const CSRF_EXEMPT_PATHS = new Set(['/api/billing/webhook']);

/**
 * Cross-site request forgery guard. A page on another site can make a browser send our cookie
 * with a form post, but it cannot add a custom header without a CORS preflight, which we never
 * grant. So a state-changing request without the header did not come from our own client.
 */
export const requireCsrfHeader: RequestHandler = (req, _res, next) => {
  if (SAFE.has(req.method) || req.get(CSRF_HEADER) === '1') return next();
  if (req.method === 'POST' && CSRF_EXEMPT_PATHS.has(`${req.baseUrl}${req.path}`)) return next();
  next(new HttpError(403, 'forbidden', 'This request is missing the X-Rotaloom-CSRF header', [{ path: `headers.${CSRF_HEADER}`, message: 'must be 1' }]));
};
