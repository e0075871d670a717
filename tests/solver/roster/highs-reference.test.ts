/**
 * The independent MIP reference of solver/bench/highs-mip.ts, solved by HiGHS (the HiGHS
 * optimisation suite, University of Edinburgh, compiled to WebAssembly: npm package `highs`).
 *
 * 1. The encoding is exact: on models and rosters small enough to enumerate, HiGHS's optimum
 *    equals exhaustive enumeration (every factor kind: unary, pairwise, sameKey, sparsePair,
 *    2-ary and n-ary allDifferent, soft allDifferent, counting with hard and soft sums, table),
 *    and on the small rosters also the brute force over rosters scored by scoreRoster.
 * 2. On the Willowmere demo: our solver's score ≤ HiGHS's best roster value ≤ the optimum ≤ our
 *    reported bound, and our score ≤ HiGHS's LP relaxation value (a proven upper bound).
 */
import { describe, expect, it } from 'vitest';
import { makeWillowmereRoster } from '../../../shared/demo/willowmere';
import type { Factor, Model } from '../../../solver/model';
import { score as modelScore } from '../../../solver/model';
import { enumerateModel } from '../../../solver/inference';
import { compileRoster } from '../../../solver/roster/compile';
import { solveRoster } from '../../../solver/roster/solve-roster';
import { highsOptimum } from '../../../solver/bench/highs-mip';
import { makeRandomModel } from '../helpers/models';
import { bruteForceBest, smallWeekRoster } from './helpers';
import { rosterSchema, type Roster } from '../../../shared/roster/schema';

const close = (a: number, b: number) => (b === -Infinity ? expect(a).toBe(-Infinity) : expect(a).toBeCloseTo(b, 6));

describe('HiGHS MIP encoding equals enumeration on small models', () => {
  it.each([1, 2, 3, 4, 5, 6, 7, 8])('random model %i (every factor kind)', async (seed) => {
    const model = makeRandomModel({ seed, n: 7, k: 3, edges: 12, kinds: ['pairwise', 'sameKey', 'sparsePair', 'allDifferent2', 'softAllDifferent'] });
    // plus a dense 3-ary table and a soft n-ary all-different with a penalty
    const extra: Factor[] = [
      { kind: 'table', vars: [0, 3, 6], table: Array.from({ length: 27 }, (_, e) => (e % 11 === 5 ? -Infinity : ((e * 7919 + seed) % 13) / 6 - 1)) },
      { kind: 'allDifferent', vars: [1, 2, 5], penalty: -0.75 },
      { kind: 'sparsePair', a: 2, b: 4, entries: [[0, 0, 1.5], [1, 2, 0.5], [2, 1, -0.25]], default: -Infinity },
      { kind: 'counting', vars: [1, 3, 5, 6], weights: [[[0, 1], [2, 2]], [[1, 1]], [[0, 1]], [[2, 1]]], score: [0, 0.5, 2, -1, 3] },
      // concave, then cut: the table's last entry repeats past its end (flat tail, encoded with a binary)
      { kind: 'counting', vars: [0, 2, 4, 6], weights: [[[0, 1], [1, 2]], [[1, 1]], [[2, 2]], [[0, 1]]], score: [1, 1.5, 0, -2, -5] },
      // the same over a long range (sums 0..70, cut at 65): encoded with big-M rows instead
      { kind: 'counting', vars: [0, 1, 2, 3, 4, 5, 6], weights: Array.from({ length: 7 }, (_, j) => [[j % 3, 10], [(j + 1) % 3, 3]] as [number, number][]), score: Array.from({ length: 66 }, (_, k) => -((k - 25) ** 2) / 200) },
    ];
    const m: Model = { ...model, factors: [...model.factors, ...extra], constant: 1.25 };
    const exact = enumerateModel(m);
    const h = await highsOptimum(m, { timeLimitS: 30 });
    close(h.score, exact.score);
    if (exact.score > -Infinity) {
      expect(h.status).toBe('optimal');
      close(modelScore(m, h.assignment!), exact.score);
      const lp = await highsOptimum(m, { relax: true, timeLimitS: 30 });
      expect(lp.bound).toBeGreaterThanOrEqual(exact.score - 1e-6);
    }
  });
});

/** Small rosters with every rule kind, per-person terms and an absence (issue 12). */
function smallRoster(seed: number): Roster {
  const { roster: r, rnd } = smallWeekRoster(
    seed,
    (rnd) => ({
      coverage: { weight: 5 + Math.floor(rnd() * 10), hard: rnd() < 0.3 },
      minRest: { hard: rnd() < 0.5, weight: 3 },
      maxConsecutiveDays: { days: 2, weight: 2 },
      maxNightsInRow: { nights: 1, weight: 2 },
      maxHoursPer7Days: { enabled: true, hours: 24, hard: rnd() < 0.5, weight: 1 },
      averageWeeklyHours: { hours: 20, hard: false, weight: 1 },
      contractedHours: { toleranceHours: 4, weight: 0.5 },
      fairWeekends: { weight: 2 },
      skillMix: { requirements: [{ skill: 'first-aid', min: 1 }], weight: 2 },
    }),
    { earlyDays: ['mon', 'wed', 'thu', 'sat'], nightDay: 'tue' },
  );
  const [a, b, c] = r.people.map((p) => p.id);
  return rosterSchema.parse({
    ...r,
    people: r.people.map((p) =>
      p.id === a ? { ...p, terms: [{ kind: 'noNights', hard: rnd() < 0.5, weight: 3 }] } : p.id === b ? { ...p, terms: [{ kind: 'maxShiftsPerWeek', count: 2, hard: rnd() < 0.5, weight: 2 }, { kind: 'minHours', hours: 16, hard: false, weight: 1 }] } : p,
    ),
    absences: [{ person: c, kind: 'annual', start: '2027-01-07T00:00', end: '2027-01-08T00:00', creditHours: 8 }],
  });
}

describe('HiGHS on compiled small rosters equals brute force over rosters (scoreRoster)', () => {
  it.each([1, 2, 3, 4, 5])('roster seed %i', async (seed) => {
    const r = smallRoster(seed);
    expect(r.seats.length).toBeLessThanOrEqual(8);
    const best = bruteForceBest(r);
    const c = compileRoster(r);
    const h = await highsOptimum(c.model, { timeLimitS: 30 });
    close(h.score, best);
    close(enumerateModel(c.model).score, best);
  });
});

describe('the Willowmere demo: our score ≤ HiGHS ≤ our bound', () => {
  it('3 s solve against HiGHS (MIP from our roster, 30 s; LP relaxation)', async () => {
    const roster = makeWillowmereRoster();
    const solved = await solveRoster(roster, { timeLimitMs: 3_000, seed: 1 });
    if (solved.status !== 'solved') throw new Error('demo did not solve');
    const { score, bound } = solved.result;
    expect(score).toBeGreaterThan(-Infinity);
    const model = solved.compiled.model;
    const lp = await highsOptimum(model, { relax: true, timeLimitS: 120 });
    expect(lp.status).toBe('optimal');
    // the LP relaxation value is a proven upper bound on the optimum, so on our score
    expect(score).toBeLessThanOrEqual(lp.bound + 1e-6);
    const mip = await highsOptimum(model, { timeLimitS: 30, start: solved.result.assignment });
    // HiGHS's best roster is a feasible roster: at most the optimum, so at most any valid bound
    expect(mip.score).toBeGreaterThanOrEqual(score - 1e-6); // it started from ours
    expect(mip.score).toBeLessThanOrEqual(bound + 1e-6);
    expect(mip.score).toBeLessThanOrEqual(lp.bound + 1e-6);
    // and HiGHS's own proven bound is consistent with ours being an upper bound of a feasible value
    expect(mip.bound).toBeGreaterThanOrEqual(mip.score - 1e-6);
    if (mip.status === 'optimal') expect(bound).toBeGreaterThanOrEqual(mip.score - 1e-6);
  }, 400_000);
});
