/**
 * docs/roster-format.md and docs/roster-format.schema.json stay true: the example parses,
 * solves to what the text says, and the JSON Schema file is what the zod schema generates.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { parseRoster } from '../../shared/roster/schema';
import { rosterJsonSchema } from '../../shared/roster/write-json-schema';
import { compileRoster } from '../../solver/roster/compile';
import { decodeAssignment } from '../../solver/roster/decode';
import { scoreRoster } from '../../solver/roster/score-roster';
import { enumerateModel } from '../../solver/inference';
import { withCatalogueTables } from '../../solver/roster/rules/write-docs';

const doc = readFileSync(new URL('../../docs/roster-format.md', import.meta.url), 'utf8');

describe('docs/roster-format.md', () => {
  const example = JSON.parse(/```json\n([\s\S]*?)```/.exec(doc)![1]);

  it('has an example that validates', () => {
    const r = parseRoster(example);
    expect(r.ok ? [] : r.issues).toEqual([]);
  });

  it('solves (exactly, by enumeration) to the roster the text describes', () => {
    const r = parseRoster(example);
    if (!r.ok) throw new Error('example invalid');
    const c = compileRoster(r.roster);
    const best = enumerateModel(c.model);
    expect(best.score).toBe(-108);
    const a = decodeAssignment(c, best.assignment).assignment;
    expect(a).toEqual({ 'early-1': null, 'early-2': 'ivo', 'late-1': 'tam', 'night-1': 'wren' });
    expect(scoreRoster(r.roster, a).total).toBe(-108);
  });

  it('the JSON Schema file is the generated one', () => {
    const file = JSON.parse(readFileSync(new URL('../../docs/roster-format.schema.json', import.meta.url), 'utf8'));
    expect(file).toEqual(JSON.parse(JSON.stringify(rosterJsonSchema())));
  });

  it('carries the rule and term tables exactly as the catalogue writes them (solver/roster/rules/write-docs.ts)', () => {
    expect(withCatalogueTables(doc)).toBe(doc);
  });

  it('documents every rule with its default', () => {
    const r = parseRoster({ period: { start: '2027-01-04', end: '2027-01-04', timeZone: 'UTC' }, skills: [], people: [], shifts: [], seats: [] });
    if (!r.ok) throw new Error('minimal roster invalid');
    for (const [name, rule] of Object.entries(r.roster.rules)) {
      const row = doc.split('\n').find((l) => l.startsWith(`| \`${name}\``));
      expect(row, name).toBeDefined();
      expect(row).toContain(rule.hard ? 'hard' : 'soft');
    }
  });
});
