import type { FieldErrors, FieldValues, Resolver } from 'react-hook-form';
import type { z } from 'zod';
import { ApiError } from '@/hooks/api/api-client';
import { loadFormKit } from './form-kit-load';

/**
 * A react-hook-form resolver that turns what was typed (numbers are text while typed) into the
 * request body and checks it with the endpoint's shared schema, the one the server validates with.
 * Form fields carry the body's names, so zod's paths are the form's field names and a submit
 * hands the parsed body to the mutation. zod's resolver comes with the form library (form-kit.tsx),
 * already loaded by the time a form can be submitted.
 */
export function bodyResolver<V extends FieldValues, S extends z.ZodType>(schema: S, toBody: (values: V) => unknown): Resolver<V, unknown, z.output<S>> {
  let check: Resolver<FieldValues, unknown, z.output<S>> | undefined;
  return (async (values: V, context: unknown, options: Parameters<Resolver<FieldValues>>[2]) => {
    check ??= (await loadFormKit()).zodResolver(schema as never) as unknown as Resolver<FieldValues, unknown, z.output<S>>;
    return check(toBody(values) as FieldValues, context, options);
  }) as unknown as Resolver<V, unknown, z.output<S>>;
}

/** A field's message: the form's own check first, then what the server said about that field. */
export function messageFor(errors: FieldErrors, serverError: unknown, name: string): string | undefined {
  const own = errors[name]?.message;
  if (typeof own === 'string') return own;
  return serverError instanceof ApiError ? serverError.fieldMessage(name) : undefined;
}
