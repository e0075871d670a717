import { z } from 'zod';

/** Seats the admin wants paid for (normally the number of people in the workspace). */
export const seatsBody = z.object({
  quantity: z.coerce.number({ error: 'Enter a number of seats' }).int('Whole seats only').min(1, 'At least one seat').max(10_000, 'At most 10,000 seats'),
});
export type SeatsInput = z.infer<typeof seatsBody>;

export const cancelBody = z.object({
  /** true: stop at the end of the paid period; false: keep the plan after all. */
  atPeriodEnd: z.boolean({ error: 'Say whether to stop at the end of the period' }),
});

export const invoicesQuery = z.object({
  limit: z.coerce.number().int().min(1).max(100).default(24),
});
