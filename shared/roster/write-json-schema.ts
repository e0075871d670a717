/**
 * Writes docs/roster-format.schema.json from the zod schemas:
 *   npx tsx shared/roster/write-json-schema.ts
 * The JSON Schema describes the shape of an input file (defaults may be left out); the
 * cross-reference checks (unknown ids, a shift ending before it starts, a pairing of a person
 * with themself, the 366-day limit) are only in the zod schema, which the server and CLI apply.
 */
import { writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { z } from 'zod';
import { rosterSchema } from './schema';

export function rosterJsonSchema(): Record<string, unknown> {
  const schema = z.toJSONSchema(rosterSchema, { io: 'input', unrepresentable: 'any' }) as Record<string, unknown>;
  return {
    $schema: schema.$schema,
    $id: 'https://rotaloom.invalid/schemas/roster-format.schema.json',
    title: 'Rotaloom roster',
    description:
      'A roster period with people, skills, shifts, seats, wishes, pairings, pins and rules. See docs/roster-format.md. Cross-reference checks (ids, shift order, period length) are applied by the zod schema in shared/roster/schema.ts, not here.',
    ...Object.fromEntries(Object.entries(schema).filter(([k]) => k !== '$schema')),
  };
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const out = new URL('../../docs/roster-format.schema.json', import.meta.url);
  writeFileSync(out, JSON.stringify(rosterJsonSchema(), null, 2) + '\n');
  console.log(`wrote ${fileURLToPath(out)}`);
}
