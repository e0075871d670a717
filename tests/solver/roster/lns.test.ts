/**
 * Large-neighbourhood search (solver/roster/lns.ts). Checked against brute force:
 * - the conditioned sub-model scores every completion of the free variables exactly as the whole
 *   model does, and its best (enumeration) is the best completion found by trying them all;
 * - one re-planned neighbourhood (HiGHS, npm `highs`) reaches that brute-force best;
 * - LNS never reports a roster above the brute-force optimum over all fillings scored with
 *   scoreRoster, and its roster's model score equals scoreRoster's total.
 */
import { describe, expect, it } from 'vitest';
import { seededRandom } from '../../../shared/demo/make-roster';
import type { Roster } from '../../../shared/roster/schema';
import { enumerateModel } from '../../../solver/inference';
import { score as modelScore } from '../../../solver/model';
import { compileRoster, type CompiledRoster } from '../../../solver/roster/compile';
import { decodeAssignment } from '../../../solver/roster/decode';
import { greedyAssignment } from '../../../solver/roster/greedy';
import { conditionModel, createLns, dayNeighbourhood, peopleNeighbourhood, rosterLayout, settleAux, solveNeighbourhood } from '../../../solver/roster/lns';
import { loadHighsRuntime } from '../../../solver/roster/bound/highs';
import { solveRoster } from '../../../solver/roster/solve-roster';
import { bruteForceBest, randomValues, scoreRoster, smallWeekRoster } from './helpers';

/** 3 people, one week, 6 seats, the weekly rest on (rest-choice aux variables), pairings, skill mix. */
function small(seed: number): Roster {
  const { roster: r } = smallWeekRoster(seed, (rnd) => ({
    coverage: { weight: 2 + Math.floor(rnd() * 6) },
    minRest: { hard: seed % 2 === 0, weight: 3 },
    weeklyRest: { enabled: true, days: 3, hours: 30, hard: seed % 2 === 1, weight: 4 },
    maxConsecutiveDays: { days: 2, weight: 2 },
    contractedHours: { toleranceHours: 4, weight: 0.5 },
    fairNights: { weight: 1 },
    skillMix: { requirements: [{ skill: 'first-aid', min: 1 }], weight: 2 },
  }));
  return { ...r, seats: r.seats.slice(0, 6) };
}

/** Best whole-model score over every completion of the free variables (others as in x): brute force. */
function bestCompletion(c: CompiledRoster, x: Int32Array, free: number[], allow?: (i: number, v: number) => boolean): number {
  const vars = c.model.variables;
  const y = Int32Array.from(x);
  let best = -Infinity;
  const rec = (k: number) => {
    if (k === free.length) {
      best = Math.max(best, modelScore(c.model, y));
      return;
    }
    const i = free[k]!;
    for (let v = 0; v < vars[i]!.cardinality; v++) {
      if (v !== x[i] && allow && !allow(i, v)) continue;
      y[i] = v;
      rec(k + 1);
    }
    y[i] = x[i]!;
  };
  rec(0);
  return best;
}

describe('LNS sub-models equal the whole model on their neighbourhood (brute force)', () => {
  it.each([1, 2, 3, 4])('seed %i: every completion scores the same, the best is the brute-force best', (seed) => {
    const c = compileRoster(small(seed));
    const L = rosterLayout(c);
    const rnd = seededRandom(seed * 31 + 7);
    for (let trial = 0; trial < 4; trial++) {
      const x = randomValues(c, seed * 10 + trial);
      const cur = modelScore(c.model, x);
      const d = Math.floor(rnd() * L.days);
      const nb = trial % 2 === 0 ? dayNeighbourhood(L, d, Math.min(L.days - 1, d + 1)) : peopleNeighbourhood(c, L, x, [trial % 3]);
      if (nb.free.length === 0 || nb.free.length > 9) continue;
      const sub = conditionModel(c.model, L.byVar, x, nb.free, nb.allow, Number.isFinite(cur) ? cur : undefined);
      expect(sub).not.toBeNull();
      // the start is the current roster, scored the same
      if (Number.isFinite(cur)) expect(modelScore(sub!.model, sub!.start)).toBeCloseTo(cur, 9);
      // each completion: sub-model score = whole-model score
      const y = Int32Array.from(x);
      const e = enumerateModel(sub!.model);
      sub!.vars.forEach((i, k) => (y[i] = sub!.values[k]![e.assignment[k]!]!));
      expect(e.score).toBeCloseTo(modelScore(c.model, y), 9);
      expect(e.score).toBeCloseTo(bestCompletion(c, x, nb.free, nb.allow), 9);
    }
  });
});

describe('one re-planned neighbourhood reaches the brute-force best completion (HiGHS)', () => {
  it.each([1, 2, 3])('seed %i', async (seed) => {
    const highs = await loadHighsRuntime();
    const c = compileRoster(small(seed));
    const L = rosterLayout(c);
    const x = greedyAssignment(c);
    const cur = modelScore(c.model, x);
    expect(cur).toBeGreaterThan(-Infinity);
    for (let d = 0; d < L.days; d++) {
      const nb = dayNeighbourhood(L, d, d);
      if (!nb.free.length || nb.free.length > 9) continue;
      const r = solveNeighbourhood(c, L, highs, x, cur, nb, 10_000);
      expect(r).not.toBe('unsolved');
      // settleAux may fix aux variables the neighbourhood cannot touch; the best completion over
      // the whole neighbourhood is still what a re-plan must reach
      const best = bestCompletion(c, x, nb.free);
      const got = r && r !== 'unsolved' ? r.score : cur;
      expect(got).toBeCloseTo(Math.max(cur, best), 6);
      const xs = Int32Array.from(x);
      expect(settleAux(c, xs, nb.free).free.length).toBeLessThanOrEqual(nb.free.length);
    }
  });
});

describe('LNS never beats the brute-force optimum, and its roster is what scoreRoster says', () => {
  it.each([1, 2, 3, 4])('seed %i', async (seed) => {
    const r = small(seed);
    const best = bruteForceBest(r);
    const highs = await loadHighsRuntime();
    const c = compileRoster(r);
    const x = greedyAssignment(c);
    const start = modelScore(c.model, x);
    const lns = createLns(c, highs, x, { seed });
    let clock = 0;
    for (let k = 0; k < 12; k++) lns.run({ deadline: ++clock, now: () => clock });
    expect(lns.score).toBeGreaterThanOrEqual(start);
    expect(lns.score).toBeLessThanOrEqual(best + 1e-9);
    expect(modelScore(c.model, x)).toBeCloseTo(lns.score, 9);
    expect(scoreRoster(r, decodeAssignment(c, x).assignment).total).toBeCloseTo(lns.score, 9);
  });
  it('solveRoster with LNS: score = scoreRoster, bound ≥ brute-force optimum ≥ score', async () => {
    const r = small(5);
    const best = bruteForceBest(r);
    const solved = await solveRoster(r, { timeLimitMs: 1_500, seed: 1 });
    if (solved.status !== 'solved') throw new Error('infeasible');
    expect(solved.score.total).toBeCloseTo(solved.result.score, 9);
    expect(solved.result.score).toBeLessThanOrEqual(best + 1e-9);
    expect(solved.result.bound).toBeGreaterThanOrEqual(best - 1e-9);
  });
});
