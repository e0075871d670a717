import { describe, expect, it } from 'vitest';
import { gapWords } from '../../../components/rosters/format';

// gap = (bound − score) / max(1, |score|), as solver/inference/solve.ts reports it; figures by hand.
describe('gapWords: how far from the best possible roster, in words', () => {
  it('says a percentage while the gap is under 100 %', () => {
    expect(gapWords(1000, 1014, 0.014)).toBe('At most 1.4% from the best possible roster (the best possible scores at most 1,014 points).');
    expect(gapWords(500, 500.2, 0.0004)).toMatch(/^At most less than 0\.1% from/);
  });

  it('says points once a percentage of a score near zero would mislead', () => {
    // demo after 10 s: 13 points, bound 58.1 → (58.1 − 13) / 13 = 347 %
    expect(gapWords(13, 58.1, (58.1 - 13) / 13)).toBe('At most 45 points below the best possible roster (the best possible scores at most 58 points).');
    expect(gapWords(-3, 4, 7 / 3)).toBe('At most 7.0 points below the best possible roster (the best possible scores at most 4.0 points).');
  });

  it('proven, no roster, no bound', () => {
    expect(gapWords(20, 20, 0, true)).toBe('Proven the best possible roster for these rules and wishes.');
    expect(gapWords(null, null, null)).toBe('No roster that keeps every hard rule has been found yet.');
    expect(gapWords(5, null, null)).toBe('Score found; no bound on the best possible roster yet.');
  });

  it('counts concessions against the ideal when the run carries it', () => {
    // ideal 264, score 16, bound 20 → gives up 248, at least 244; (20 − 16) / 248 = 1.6 % avoidable
    expect(gapWords(16, 20, 0.25, false, 264)).toBe('This roster gives up 248 points; no roster can give up fewer than 244. At most 1.6% of what it gives up could still be avoided.');
    expect(gapWords(-36.5, -36.5, 0, true, 30)).toBe('Proven the best possible roster for these rules and wishes: it gives up 67 points, and no roster can give up fewer.');
    // runs stored before the ideal was kept fall back to the old words
    expect(gapWords(13, 58.1, (58.1 - 13) / 13, false, null)).toMatch(/^At most 45 points below/);
  });
});
