// The solve CLI: MPE output checked against exact enumeration of the same file,
// JSON fields, and one-line errors with exit code 2.
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../../solver/cli/solve';
import { parseMpe, parseUai, writeUai } from '../../../solver/io';
import { enumerateModel } from '../../../solver/inference';
import { score } from '../../../solver/model';
import { makeRandomModel } from '../helpers/models';

const dir = mkdtempSync(join(tmpdir(), 'rotaloom-solve-'));
const file = (name: string, text: string) => {
  const p = join(dir, name);
  writeFileSync(p, text);
  return p;
};

async function run(argv: string[]) {
  let out = '', err = '';
  const code = await main(argv, (s) => (out += s), (s) => (err += s));
  return { code, out, err };
}

describe('solve CLI', () => {
  it('prints the MAP assignment in UAI MPE format, optimal by enumeration', async () => {
    const m = makeRandomModel({ seed: 3, n: 9, k: 3, edges: 14 });
    const p = file('m.uai', writeUai(m));
    const { code, out, err } = await run([p, '--time-limit', '5', '--seed', '2']);
    expect(err).toBe('');
    expect(code).toBe(0);
    const lines = out.trim().split('\n');
    expect(lines[0]).toBe('MPE');
    const x = parseMpe(out, 9);
    const parsed = parseUai(writeUai(m)).model;
    expect(score(parsed, x)).toBeCloseTo(enumerateModel(parsed).score, 9);
  });

  it('--json gives assignment, score, bound, gap, iterations and time', async () => {
    const m = makeRandomModel({ seed: 4, n: 8, k: 3, edges: 12 });
    const { code, out } = await run([file('j.uai', writeUai(m)), '--json']);
    expect(code).toBe(0);
    const j = JSON.parse(out) as Record<string, unknown>;
    for (const k of ['assignment', 'score', 'bound', 'gap', 'iterations', 'timeMs']) expect(j).toHaveProperty(k);
    const parsed = parseUai(writeUai(m)).model;
    expect(j.score as number).toBeCloseTo(enumerateModel(parsed).score, 9);
    expect(j.bound as number).toBeGreaterThanOrEqual((j.score as number) - 1e-9);
  });

  it('a missing file, a malformed file and a zero-probability model give one line and exit 2', async () => {
    const missing = await run([join(dir, 'nope.uai')]);
    expect(missing.code).toBe(2);
    expect(missing.err.trim().split('\n')).toHaveLength(1);
    expect(missing.err).toContain('nope.uai');

    const broken = await run([file('b.uai', 'MARKOV\n2\n2 2\n1\n2 0 1\n\n4\n0.5 0.5 abc 1\n')]);
    expect(broken.code).toBe(2);
    expect(broken.err).toMatch(/line 8: .*"abc"/); // line 8 holds the table values
    expect(broken.err.trim().split('\n')).toHaveLength(1);

    const zeros = await run([file('z.uai', 'MARKOV\n2\n2 2\n2\n1 0\n2 0 1\n\n2\n1 1\n\n4\n0 0 0 0\n')]);
    expect(zeros.code).toBe(2);
    expect(zeros.err).toMatch(/line 12: zero-probability/);

    // every table has mass, but no joint assignment does: x0 must be 0 and x1 must differ... and equal
    const conflict = await run([file('c.uai', 'MARKOV\n2\n2 2\n3\n1 0\n2 0 1\n2 0 1\n\n2\n1 0\n\n4\n1 0 0 1\n\n4\n0 1 1 0\n')]);
    expect(conflict.code).toBe(2);
    expect(conflict.err).toMatch(/zero-probability/);
    expect(conflict.err.trim().split('\n')).toHaveLength(1);

    const usage = await run([]);
    expect(usage.code).toBe(2);
  });

  it('runs through npm run solve with exit code 2 on errors', () => {
    const ok = spawnSync('npm', ['run', '--silent', 'solve', '--', file('s.uai', 'MARKOV\n1\n3\n1\n1 0\n\n3\n0.2 0.5 0.3\n')], { encoding: 'utf8' });
    expect(ok.status).toBe(0);
    expect(ok.stdout.trim().split('\n')).toEqual(['MPE', '1 1']);
    const bad = spawnSync('npm', ['run', '--silent', 'solve', '--', join(dir, 'missing.uai')], { encoding: 'utf8' });
    expect(bad.status).toBe(2);
    expect(bad.stderr.trim().split('\n')).toHaveLength(1);
  }, 30_000);
});
