import { describe, expect, it } from 'vitest';
import { createPersonBody } from '../../../shared/api/people';
import { patternBody } from '../../../shared/api/rosters';
import { ApiError } from '../../../hooks/api/api-client';
import { bodyResolver, messageFor } from '../../../components/forms/schema-form';

type Typed = { name: string; email: string; contractedHours: string; skillIds: number[] };
const toBody = (v: Typed) => ({ ...v, email: v.email || null, contractedHours: v.contractedHours === '' ? Number.NaN : Number(v.contractedHours) });
const resolve = (values: Typed) => bodyResolver(createPersonBody, toBody)(values, undefined, { fields: {}, shouldUseNativeValidation: false });

// The resolver must say what zod says about the same body (zod's safeParse is the reference),
// under the form's field names, and hand over zod's parsed output on success.
describe('bodyResolver: form text checked with the shared body schema', () => {
  it('passes the parsed body through when the schema accepts it', async () => {
    const typed = { name: 'Orla Penhallow', email: '', contractedHours: '37.5', skillIds: [3] };
    const result = await resolve(typed);
    expect(result.errors).toEqual({});
    expect(result.values).toEqual(createPersonBody.parse(toBody(typed)));
  });

  it("puts zod's message for each bad field under that field's name", async () => {
    const typed = { name: '', email: 'not an address', contractedHours: 'lots', skillIds: [] };
    const result = await resolve(typed);
    const zod = createPersonBody.safeParse(toBody(typed));
    if (zod.success) throw new Error('the reference accepted a bad body');
    const firstByField = new Map<string, string>();
    for (const issue of zod.error.issues) if (!firstByField.has(String(issue.path[0]))) firstByField.set(String(issue.path[0]), issue.message);
    expect(Object.keys(result.errors).sort()).toEqual([...firstByField.keys()].sort());
    for (const [field, message] of firstByField) expect(messageFor(result.errors, null, field)).toBe(message);
  });

  it('nests errors of list items (seats.1.count) as react-hook-form reads them', async () => {
    const pattern = { label: 'early', weekdays: ['mon'], startTime: '07:00', endTime: '15:00', seats: [{ skillId: null, count: 1 }, { skillId: null, count: -2 }] };
    const result = await bodyResolver(patternBody, (v: typeof pattern) => v)(pattern, undefined, { fields: {}, shouldUseNativeValidation: false });
    const zod = patternBody.safeParse(pattern);
    if (zod.success) throw new Error('the reference accepted a negative seat count');
    expect(zod.error.issues[0].path).toEqual(['seats', 1, 'count']);
    expect((result.errors as { seats?: Array<{ count?: { message?: string } }> }).seats?.[1]?.count?.message).toBe(zod.error.issues[0].message);
  });

  it("falls back to the server's message for a field the form found nothing wrong with", () => {
    const server = new ApiError(409, 'conflict', 'Address in use', [{ path: 'body.email', message: 'address taken' }]);
    expect(messageFor({}, server, 'email')).toBe('address taken');
    expect(messageFor({ email: { type: 'x', message: 'ours first' } }, server, 'email')).toBe('ours first');
  });
});
