import { z } from 'zod';

/** `?page=2&pageSize=50&sort=name&order=desc`, with the sortable fields named per endpoint. */
export function listQuerySchema<const F extends readonly [string, ...string[]]>(sortFields: F, defaultSort: F[number]) {
  return z.object({
    page: z.coerce.number().int().min(1).default(1),
    pageSize: z.coerce.number().int().min(1).max(200).default(50),
    sort: z.enum(sortFields).default(defaultSort as never),
    order: z.enum(['asc', 'desc']).default('asc'),
    q: z.string().max(120).optional(),
  });
}

export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
}

export const idParams = z.object({ id: z.coerce.number().int().min(1, 'must be a positive id') });
export const versionField = z.number({ error: 'the version you last saw is required' }).int().min(1);
