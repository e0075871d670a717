/**
 * The UAI export of a roster: counting factors expanded into partial-sum chains keep every
 * score (checked on random seat assignments), and the file an independent UAI reader parses
 * back scores the same roster the same, up to the writer's normalising offset.
 */
import { describe, expect, it } from 'vitest';
import { makeRoster, seededRandom } from '../../../shared/demo/make-roster';
import { compileRoster } from '../../../solver/roster/compile';
import { expandCountingForUai } from '../../../solver/roster/uai-expand';
import { parseUai, writeUaiWithOffset } from '../../../solver/io/uai';
import { score } from '../../../solver/model';
import { randomValues } from './helpers';

describe('expandCountingForUai', () => {
  const roster = makeRoster({ people: 4, weeks: 1, seed: 9, rules: { minRest: { hard: false }, weeklyRest: { hard: false }, shiftsPerWindow: { enabled: true, hard: false, maxShifts: 3 }, maxHoursPer7Days: { hard: false, hours: 30 } } });
  const c = compileRoster(roster);
  const ex = expandCountingForUai(c.model);

  it('leaves no counting factor and no table above a few hundred entries', () => {
    expect(ex.model.factors.some((f) => f.kind === 'counting')).toBe(false);
    expect(c.model.factors.some((f) => f.kind === 'counting')).toBe(true);
    const { text } = writeUaiWithOffset(ex.model);
    expect(text.length).toBeLessThan(5_000_000);
  });

  it('scores every seat assignment as the compiled model does', () => {
    const rnd = seededRandom(5);
    for (let k = 0; k < 40; k++) {
      const x = k % 2 ? randomValues(c, k) : c.domains.map((d) => Math.floor(rnd() * d.length));
      const full = ex.complete(x);
      expect(full.slice(0, ex.originalVariables)).toEqual(Array.from(x));
      const a = score(c.model, x);
      const b = score(ex.model, full);
      if (a === -Infinity) expect(b).toBe(-Infinity);
      else expect(b).toBeCloseTo(a, 9);
    }
  });

  it('round-trips through the UAI text: parsed score + offset = roster model score', () => {
    const { text, offset } = writeUaiWithOffset(ex.model);
    const parsed = parseUai(text);
    const x = randomValues(c, 77);
    const a = score(c.model, x);
    const b = score(parsed.model, ex.complete(x)) + offset;
    if (a === -Infinity) expect(b).toBe(-Infinity);
    else expect(b).toBeCloseTo(a, 6);
  });
});
