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

/** Last middleware: every failure leaves as JSON, never as an HTML page or a stack trace. */
export const errorHandler: ErrorRequestHandler = (err, _req, res, _next) => {
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
