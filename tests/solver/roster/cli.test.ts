import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../../solver/roster/cli';
import { makeRoster } from '../../../shared/demo/make-roster';
import { makeWillowmereRoster } from '../../../shared/demo/willowmere';
import { parseRoster } from '../../../shared/roster/schema';
import { scoreRoster } from '../../../solver/roster/score-roster';

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'roster-cli-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function run(args: string[]) {
  let out = '';
  let err = '';
  const o = vi.spyOn(process.stdout, 'write').mockImplementation((s) => ((out += String(s)), true));
  const e = vi.spyOn(process.stderr, 'write').mockImplementation((s) => ((err += String(s)), true));
  try {
    const code = await main(args);
    return { code, out, err };
  } finally {
    o.mockRestore();
    e.mockRestore();
  }
}

const file = (name: string, content: string) => {
  const p = join(dir, name);
  writeFileSync(p, content);
  return p;
};

describe('solve --roster', () => {
  it('bad files and arguments: one line on stderr, exit code 2', async () => {
    const cases: [string[], RegExp][] = [
      [['--roster', join(dir, 'missing.json')], /cannot read/],
      [['--roster', file('broken.json', '{ "period": ')], /not JSON/],
      [['--roster', file('self.json', JSON.stringify({ ...makeRoster({ people: 3, weeks: 1 }), pairings: [{ a: 'p001', b: 'p001', score: 1 }] }))], /pairings\[0\]\.b: a pairing of "p001" with themself/],
      [['--time-limit', '2'], /--roster is required/],
      [['--roster', 'x.json', '--time-limit', 'soon'], /--time-limit/],
      [['--roster', 'x.json', '--frobnicate'], /unknown argument --frobnicate/],
    ];
    for (const [args, message] of cases) {
      const r = await run(args);
      expect(r.code, args.join(' ')).toBe(2);
      expect(r.err).toMatch(message);
      expect(r.err.trim().split('\n')).toHaveLength(1);
      expect(r.out).toBe('');
    }
  });

  it('a roster that cannot be feasible: the reasons in words, exit code 1', async () => {
    const r = makeWillowmereRoster({ rules: { coverage: { hard: true } } });
    const bad = { ...r, wishes: ['imogen', 'tobias', 'delphine'].map((person) => ({ person, date: '2027-01-12', kind: 'cannot', strength: 1 })) };
    const res = await run(['--roster', file('inf.json', JSON.stringify(bad))]);
    expect(res.code).toBe(1);
    expect(res.out).toContain('Nobody can take the Night lead seat on the night shift on Tue 12 Jan: Imogen Thistlewood, Tobias Marchbank and Delphine Ashcombe cannot (their wish)');
  });

  it('--json: the solved roster, whose score the independent scorer confirms', async () => {
    const roster = makeRoster({ people: 6, weeks: 1, seed: 2 });
    const p = file('small.json', JSON.stringify(roster));
    const res = await run(['--roster', p, '--time-limit', '1', '--json']);
    expect(res.code).toBe(0);
    const out = JSON.parse(res.out);
    expect(out.feasible).toBe(true);
    const parsed = parseRoster(JSON.parse(readFileSync(p, 'utf8')));
    if (!parsed.ok) throw new Error('fixture invalid');
    expect(scoreRoster(parsed.roster, out.assignment).total).toBeCloseTo(out.score, 9);
    expect(out.people).toHaveLength(6);
    expect(Object.keys(out.assignment)).toHaveLength(roster.seats.length);
    expect(out.bound).toBeGreaterThanOrEqual(out.score - 1e-6);
  });

  it('table output: a row per day, hours per person, and the score line', async () => {
    const res = await run(['--roster', file('small2.json', JSON.stringify(makeRoster({ people: 6, weeks: 1, seed: 2 }))), '--time-limit', '1']);
    expect(res.code).toBe(0);
    expect(res.out).toMatch(/^day\s+early\s+late\s+night$/m);
    expect(res.out).toMatch(/^Mon 4 Jan /m);
    expect(res.out).toContain('hours per person:');
    expect(res.out).toMatch(/^score -?\d+\.\d\d, bound/m);
  });
});
