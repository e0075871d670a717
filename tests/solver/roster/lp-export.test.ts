/**
 * --export-lp (solver/roster/lp-export.ts): the file is read by HiGHS (npm `highs`, an outside
 * MIP solver) and its optimum, plus the constant in the header, is the roster optimum found by
 * brute force over every roster scored with scoreRoster.
 */
import { describe, expect, it } from 'vitest';
import { makeRoster } from '../../../shared/demo/make-roster';
import { compileRoster } from '../../../solver/roster/compile';
import { rosterLp } from '../../../solver/roster/lp-export';
import { loadHighs } from '../../../solver/bench/highs-mip';
import { bruteForceBest } from './helpers';

describe('roster LP export', () => {
  it('HiGHS reads it and its optimum + constant is the brute-force roster optimum', async () => {
    const r = makeRoster({
      people: 3,
      weeks: 1,
      seed: 4,
      wishesPerPerson: 2,
      pairingCount: 1,
      period: { start: '2027-01-04', end: '2027-01-10', timeZone: 'Europe/London' },
      patterns: [
        { label: 'early', weekdays: ['mon', 'wed', 'fri'], start: '07:00', end: '15:00', seats: [{ skill: null, count: 1 }] },
        { label: 'late', weekdays: ['tue', 'sat'], start: '15:00', end: '23:00', seats: [{ skill: null, count: 2 }] },
      ],
    });
    const lp = rosterLp(compileRoster(r));
    const header = /roster score = objective \+ (-?[\d.e+-]+)/.exec(lp.text);
    expect(header).not.toBeNull();
    const highs = await loadHighs();
    const m = highs.createModel({ format: 'lp', data: lp.text });
    try {
      m.options.set({ output_flag: false, time_limit: 60 });
      m.run();
      expect(m.getObjectiveValue() + Number(header![1])).toBeCloseTo(bruteForceBest(r), 6);
    } finally {
      m.dispose();
    }
  }, 60_000);
});
