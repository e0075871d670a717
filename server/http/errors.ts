import type { ErrorRequestHandler, RequestHandler } from 'express';

export type ErrorCode =
  | 'bad_request'
  | 'validation_failed'
  | 'unauthenticated'
  | 'forbidden'
  | 'not_found'
  | 'conflict'
  | 'unprocessable'
  | 'gone'
  | 'rate_limited'
  | 'payload_too_large'
  | 'plan_limit'
  | 'payment_overdue'
  | 'payment_service_unavailable'
  | 'unavailable'
  | 'bad_signature'
  | 'internal';

/** One field at fault: its path in the request (`body.period.end`) and what is wrong with it. */
export interface FieldError {
  path: string;
  message: string;
}

/** An error the API reports to the client as `{ error: { code, message, fields? } }`. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode,
    message: string,
    readonly fields?: FieldError[],
    /** Response headers that go with the error (Retry-After on a 503). */
    readonly headers?: Record<string, string>,
  ) {
    super(message);
  }
}

export const notFound = (what: string) => new HttpError(404, 'not_found', `${what} not found`);

export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(new HttpError(404, 'not_found', `No API route ${req.method} ${req.originalUrl}`));
};

const CONNECTION_ERRORS = new Set([
  'SequelizeConnectionError',
  'SequelizeConnectionRefusedError',
  'SequelizeConnectionAcquireTimeoutError',
  'SequelizeConnectionTimedOutError',
  'SequelizeHostNotFoundError',
  'SequelizeHostNotReachableError',
]);
// MariaDB connector codes for a connection that broke or never answered, and the server's own
// "gone away" / "lost connection" / "shutting down" / "connection killed" (2006, 2013, 1053, 1927).
const CONNECTION_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'EPIPE', 'ETIMEDOUT', 'ER_SOCKET_TIMEOUT', 'ER_SOCKET_UNEXPECTED_CLOSE', 'ER_CONNECTION_ALREADY_CLOSED', 'ER_CMD_CONNECTION_CLOSED', 'ER_GET_CONNECTION_TIMEOUT', 'ER_CONNECTION_TIMEOUT', 'ER_POOL_ALREADY_CLOSED', 'ER_CLOSING_POOL']);
const CONNECTION_ERRNOS = new Set([2006, 2013, 1053, 1927]);

/** Whether an error means MariaDB could not be reached or stopped answering (not that a query was wrong). */
export function isDatabaseUnavailable(err: unknown): boolean {
  for (let e = err as { name?: string; code?: string; errno?: number; fatal?: boolean; parent?: unknown; original?: unknown } | null | undefined, depth = 0; e && depth < 4; depth++) {
    if (e.name && CONNECTION_ERRORS.has(e.name)) return true;
    if ((e.code && CONNECTION_CODES.has(e.code)) || (e.errno !== undefined && CONNECTION_ERRNOS.has(e.errno))) return true;
    // the connector marks errors after which the connection is unusable
    if (e.fatal === true && e.code !== 'ER_ACCESS_DENIED_ERROR') return true;
    e = (e.parent ?? e.original) as typeof e;
  }
  return false;
}

/** Seconds a client is asked to wait while the database is away. */
export const DATABASE_RETRY_AFTER_S = 5;

/** Last middleware: every failure leaves as JSON, never as an HTML page or a stack trace. */
export const errorHandler: ErrorRequestHandler = (err, _req, res, next) => {
  // An answer already on its way (a stream that failed half-way) can only be cut off.
  if (res.headersSent) return next(err);
  if (isDatabaseUnavailable(err)) {
    res.set('Retry-After', String(DATABASE_RETRY_AFTER_S));
    res.status(503).json({ error: { code: 'unavailable', message: 'The database is not answering just now; try again in a few seconds.' } });
    return;
  }
  if (err instanceof HttpError) {
    if (err.headers) res.set(err.headers);
    res.status(err.status).json({ error: { code: err.code, message: err.message, ...(err.fields ? { fields: err.fields } : {}) } });
    return;
  }
  // body-parser marks its own failures (bad JSON, too large) with a status.
  const status = typeof err?.status === 'number' ? err.status : typeof err?.statusCode === 'number' ? err.statusCode : 500;
  if (status === 413) {
    res.status(413).json({ error: { code: 'payload_too_large', message: 'The request body is too large', fields: [{ path: 'body', message: 'too large' }] } });
    return;
  }
  if (status >= 400 && status < 500) {
    res.status(status).json({ error: { code: 'bad_request', message: err.type === 'entity.parse.failed' ? 'The request body is not valid JSON' : String(err.message ?? 'Bad request'), fields: [{ path: 'body', message: 'not valid JSON' }] } });
    return;
  }
  console.error('Unhandled error:', err instanceof Error ? err.stack : err);
  res.status(500).json({ error: { code: 'internal', message: 'Something went wrong on our side; nothing was changed' } });
};
