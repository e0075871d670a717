import type { RequestHandler } from 'express';
import type { z } from 'zod';
import { HttpError, type FieldError } from './errors';

export interface RequestSchemas {
  params?: z.ZodType;
  query?: z.ZodType;
  body?: z.ZodType;
}

export function zodFields(error: z.ZodError, prefix: string): FieldError[] {
  return error.issues.map((issue) => ({
    path: [prefix, ...issue.path.map(String)].join('.'),
    message: issue.message,
  }));
}

/**
 * Validates params, query and body against the endpoint's shared schemas and replaces them
 * with the parsed values, so handlers only ever see checked data.
 */
export function validate(schemas: RequestSchemas): RequestHandler {
  return (req, _res, next) => {
    const fields: FieldError[] = [];
    const parsed: Record<string, unknown> = {};
    for (const part of ['params', 'query', 'body'] as const) {
      const schema = schemas[part];
      if (!schema) continue;
      const result = schema.safeParse(req[part] ?? {});
      if (result.success) parsed[part] = result.data;
      else fields.push(...zodFields(result.error, part));
    }
    if (fields.length > 0) {
      next(new HttpError(400, 'validation_failed', `Please check ${fields.map((f) => f.path).join(', ')}`, fields));
      return;
    }
    if (parsed.params) req.params = parsed.params as typeof req.params;
    // Express 5 makes req.query a getter; keep the parsed copy where handlers can read it.
    if (parsed.query) Object.defineProperty(req, 'query', { value: parsed.query, writable: true });
    if (parsed.body) req.body = parsed.body;
    next();
  };
}
