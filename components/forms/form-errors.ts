import type { z } from 'zod';
import { ApiError } from '@/hooks/api/api-client';

export type FieldErrors = Record<string, string | undefined>;

/** Checks form values with the endpoint's shared schema: the parsed data, or the first message per field. */
export function checkForm<S extends z.ZodType>(schema: S, values: unknown): { data: z.infer<S>; errors: null } | { data: null; errors: FieldErrors } {
  const parsed = schema.safeParse(values);
  if (parsed.success) return { data: parsed.data, errors: null };
  const errors: FieldErrors = {};
  for (const issue of parsed.error.issues) errors[String(issue.path[0])] ??= issue.message;
  return { data: null, errors };
}

/** The message for a field: the form's own check first, then what the server said about it. */
export const fieldError = (errors: FieldErrors, error: unknown, name: string) => errors[name] ?? (error instanceof ApiError ? error.fieldMessage(name) : undefined);

/** A message for the whole form, for server answers that name no field of this form. */
export function formError(error: unknown, fields: string[]): string | null {
  if (!error) return null;
  if (!(error instanceof ApiError)) return 'Something went wrong; please try again.';
  if (error.fields.length > 0 && error.fields.every((f) => fields.some((name) => f.path.endsWith(`.${name}`)))) return null;
  return error.message;
}
