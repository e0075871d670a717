/**
 * The small-roster proof step (solver/roster/bound/prove-small.ts): a roster called proven best
 * must be best. Checked against brute force over every filling scored by scoreRoster (tiny
 * rosters, with the weekly rest that gives the person/shift relaxation its integrality gap) and
 * against HiGHS's optimum of the roster's MIP run independently (12 people × 2 weeks).
 */
import { describe, expect, it } from 'vitest';
import { makeRoster } from '../../../shared/demo/make-roster';
import type { Roster } from '../../../shared/roster/schema';
import { highsOptimum } from '../../../solver/bench/highs-mip';
import { score as modelScore } from '../../../solver/model/score';
import { compileRoster } from '../../../solver/roster/compile';
import { decodeAssignment } from '../../../solver/roster/decode';
import { greedyAssignment } from '../../../solver/roster/greedy';
import { scoreGrid } from '../../../solver/roster/bound/grid';
import { proveSmall, seatValues, PROVE_SMALL_MAX_VALUES } from '../../../solver/roster/bound/prove-small';
import { solveRoster } from '../../../solver/roster/solve-roster';
import { bruteForceBest, scoreRoster, smallWeekRoster, withNeverPairing } from './helpers';

function tinyRoster(seed: number): Roster {
  const { roster } = smallWeekRoster(seed, (rnd) => ({
    coverage: { weight: 3 + Math.floor(rnd() * 6), hard: rnd() < 0.2 },
    minRest: { hard: seed % 2 === 0, weight: 3 },
    maxConsecutiveDays: { days: 2, weight: 2 },
    maxHoursPer7Days: { hours: 24, hard: rnd() < 0.5, weight: 1 },
    contractedHours: { toleranceHours: 4, weight: 0.5 },
    fairNights: { weight: 1 },
    skillMix: { requirements: [{ skill: 'first-aid', min: 1 }], weight: 2 },
  }));
  return withNeverPairing(roster, seed);
}

const close = (a: number, b: number) => expect(Math.abs(a - b)).toBeLessThan(1e-6);

describe('proveSmall on tiny rosters against brute force (every filling scored by scoreRoster)', () => {
  it.each([1, 2, 3, 4, 5, 7])('roster seed %i: from the greedy roster, then from the optimum', async (seed) => {
    const roster = tinyRoster(seed);
    expect(roster.seats.length).toBeLessThanOrEqual(8);
    const best = bruteForceBest(roster);
    const compiled = compileRoster(roster);
    const grid = scoreGrid(compiled.model);
    const greedy = Array.from(greedyAssignment(compiled));
    const start = { assignment: greedy, score: modelScore(compiled.model, greedy) };
    expect(start.score).toBeGreaterThan(-Infinity);
    const proof = (await proveSmall(roster, compiled, start, { timeLimitMs: 20_000, grid }))!;
    expect(proof).not.toBeNull();
    // brute force: the bound is never below the best roster, and a proof means the best roster
    expect(proof.bound).toBeGreaterThanOrEqual(best - 1e-9);
    expect(proof.proven).toBe(true);
    close(proof.score, best);
    close(proof.bound, proof.score);
    // scoreRoster on the roster returned (not the model's score)
    close(scoreRoster(roster, decodeAssignment(compiled, proof.assignment).assignment).total, best);
    expect(proof.improved).toBe(start.score < best - 1e-9);

    const again = (await proveSmall(roster, compiled, { assignment: proof.assignment, score: proof.score }, { timeLimitMs: 20_000, grid }))!;
    expect(again.proven).toBe(true);
    expect(again.improved).toBe(false);
    close(again.bound, best);
  });

  it('an incumbent below the optimum is never called proven at its own score (brute force)', async () => {
    for (const seed of [1, 2, 3, 4, 5, 7, 8]) {
      const roster = tinyRoster(seed);
      const best = bruteForceBest(roster);
      const compiled = compileRoster(roster);
      const greedy = Array.from(greedyAssignment(compiled));
      const score = modelScore(compiled.model, greedy);
      if (score === -Infinity || score >= best - 1e-9) continue;
      const proof = (await proveSmall(roster, compiled, { assignment: greedy, score }, { timeLimitMs: 20_000, grid: scoreGrid(compiled.model) }))!;
      // whatever HiGHS reports, proven means the returned roster reaches the brute-force best
      if (proof.proven) close(proof.score, best);
      expect(proof.bound).toBeGreaterThanOrEqual(best - 1e-9);
    }
  });
});

describe('solveRoster on 12 people × 2 weeks: proven best equals HiGHS run independently', () => {
  it('proven best, bound = score = HiGHS MIP optimum (cold, no start), scoreRoster agrees', async () => {
    const roster = makeRoster({ people: 12, weeks: 2, seed: 12 });
    const solved = await solveRoster(roster, { timeLimitMs: 40_000, seed: 1 });
    if (solved.status !== 'solved') throw new Error('infeasible');
    expect(seatValues(solved.compiled)).toBeLessThanOrEqual(PROVE_SMALL_MAX_VALUES);
    const { result } = solved;
    expect(result.optimal).toBe(true);
    expect(result.bound).toBe(result.score);
    // HiGHS (npm highs) on solver/bench/highs-mip.ts's MIP, from scratch: its proven optimum
    const highs = await highsOptimum(compileRoster(roster).model, { timeLimitS: 120 });
    expect(highs.status).toBe('optimal');
    close(result.score, highs.score);
    // scoreRoster on the decoded roster
    close(solved.score.total, highs.score);
  }, 240_000);
});
