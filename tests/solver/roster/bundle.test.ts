/**
 * The proximal bundle method on the person/shift dual (solver/roster/bound/bundle.ts) and the
 * Lagrangian behind the MapSolver interface (bound/lagrangian-solver.ts). Outside references:
 * brute force over every roster scored by scoreRoster (small rosters: every L is a bound on it,
 * by weak duality), HiGHS (npm `highs`) on the MIP of solver/bench/highs-mip.ts for a roster too
 * large to enumerate, and the closed-form solution of the two-cut QP.
 */
import { describe, expect, it } from 'vitest';
import { makeRoster } from '../../../shared/demo/make-roster';
import type { Roster } from '../../../shared/roster/schema';
import { compileRoster } from '../../../solver/roster/compile';
import { applyDual, buildLagrangian, evaluateLagrangian, type LagrangianSetup } from '../../../solver/roster/lagrangian';
import { bundleBest, bundleSteps, bundleWeights, newBundleState } from '../../../solver/roster/bound/bundle';
import { lagrangianSolver } from '../../../solver/roster/bound/lagrangian-solver';
import { greedyAssignment } from '../../../solver/roster/greedy';
import { score as modelScore } from '../../../solver/model/score';
import { highsOptimum } from '../../../solver/bench/highs-mip';
import { bruteForceBest, lagrangianRoster } from './helpers';

function setup(r: Roster): LagrangianSetup {
  const built = buildLagrangian(compileRoster(r));
  if ('unsupported' in built) throw new Error(built.unsupported);
  return built;
}

/** The best L after each single bundle iteration. */
function bestPerIteration(s: LagrangianSetup, iterations: number, target?: number): number[] {
  const state = newBundleState(s);
  const out: number[] = [];
  for (let k = 0; k < iterations && !state.converged; k++) {
    bundleSteps(s, state, { deadline: Infinity, now: () => 0, maxIterations: 1, target });
    out.push(state.best);
  }
  return out;
}

describe('bundle QP over the cut weights', () => {
  // two cuts: min over θ ∈ [0, 1] of (t/2)(θ²Q11 + 2θ(1−θ)Q12 + (1−θ)²Q22) + θα1 + (1−θ)α2 has
  // the stationary point θ = (t(Q22 − Q12) + α2 − α1) / (t(Q11 − 2Q12 + Q22)), clipped to [0, 1]
  const closedForm = (q11: number, q12: number, q22: number, a1: number, a2: number, t: number) =>
    Math.min(1, Math.max(0, (t * (q22 - q12) + a2 - a1) / (t * (q11 - 2 * q12 + q22))));
  it.each([
    [1, -1, 1, 0, 0, 1],
    [4, 1, 2, 0.5, 0, 0.3],
    [2, 0, 9, 3, 0.1, 2],
    [1, 0.5, 1, 10, 0, 0.01],
  ])('Q11=%f Q12=%f Q22=%f α=(%f, %f) t=%f matches the closed form', (q11, q12, q22, a1, a2, t) => {
    const theta = bundleWeights([[q11, q12], [q12, q22]], [a1, a2], t);
    expect(theta).not.toBeNull();
    expect(theta![0]!).toBeCloseTo(closedForm(q11, q12, q22, a1, a2, t), 6);
    expect(theta![0]! + theta![1]!).toBeCloseTo(1, 9);
  });
});

describe('bundle bound ≥ the optimum of small rosters (brute force with scoreRoster), never rising', () => {
  it.each([1, 2, 3, 4, 5, 6])('roster seed %i', (seed) => {
    const r = lagrangianRoster(seed);
    const best = bruteForceBest(r);
    const s = setup(r);
    const bounds = bestPerIteration(s, 150);
    for (const b of bounds) expect(b).toBeGreaterThanOrEqual(best - 1e-6);
    for (let k = 1; k < bounds.length; k++) expect(bounds[k]!).toBeLessThanOrEqual(bounds[k - 1]!);
    // the bound reported is L at the multipliers it names: re-evaluating there gives it back
    const state = newBundleState(s);
    bundleSteps(s, state, { deadline: Infinity, now: () => 0, maxIterations: 60 });
    const at = bundleBest(s, state);
    const again = evaluateLagrangian(s, at.mu, at.nu, new Float64Array(s.nMu), s.people.map((p) => new Float64Array(p.period.length))).L;
    expect(again).toBeCloseTo(state.best, 9);
  });

  it.each([1, 2, 3, 4])('with the weekly rest on (3-day windows, scored exactly in the DP), seed %i', { timeout: 60_000 }, (seed) => {
    const base = lagrangianRoster(seed);
    const r = { ...base, seats: base.seats.slice(0, 6), rules: { ...base.rules, weeklyRest: { ...base.rules.weeklyRest, enabled: true, days: 3, hours: 30, hard: seed % 2 === 1, weight: 4 } } };
    const best = bruteForceBest(r);
    for (const b of bestPerIteration(setup(r), 100)) expect(b).toBeGreaterThanOrEqual(best - 1e-6);
  });
});

describe('bundle bound on a roster too large to enumerate', () => {
  it('is ≥ the best roster HiGHS finds (MIP, 20 s), at every iteration', async () => {
    const roster = makeRoster({ people: 6, weeks: 1, seed: 7 });
    const c = compileRoster(roster);
    const mip = await highsOptimum(c.model, { timeLimitS: 20, start: greedyAssignment(c) });
    expect(mip.score).toBeGreaterThan(-Infinity);
    const s = setup(roster);
    const bounds = bestPerIteration(s, 200, mip.score);
    for (const b of bounds) expect(b).toBeGreaterThanOrEqual(mip.score - 1e-6);
    for (let k = 1; k < bounds.length; k++) expect(bounds[k]!).toBeLessThanOrEqual(bounds[k - 1]!);
  }, 120_000);
});

describe('the Lagrangian as a MapSolver', () => {
  it.each(['bundle', 'subgradient', 'columnGeneration'] as const)('%s: bound ≥ brute-force optimum, history never rising, the incumbent kept or bettered', async (method) => {
    const r = lagrangianRoster(2);
    const best = bruteForceBest(r);
    const compiled = compileRoster(r);
    const x = greedyAssignment(compiled);
    const score = modelScore(compiled.model, x);
    let t = 0;
    const out = await lagrangianSolver.solve(
      { compiled, incumbent: { assignment: Array.from(x), score, bound: Infinity, timeToBestMs: 0 } },
      { method, timeLimitMs: 3_000, clock: () => t++ },
    );
    expect(out.unsupported).toBeUndefined();
    expect(out.bound).toBeGreaterThanOrEqual(best - 1e-6);
    expect(out.score).toBeGreaterThanOrEqual(score);
    expect(out.score).toBeLessThanOrEqual(best + 1e-9);
    expect(modelScore(compiled.model, out.assignment)).toBeCloseTo(out.score, 9);
    expect(out.history.length).toBeGreaterThan(0);
    for (let k = 1; k < out.history.length; k++) expect(out.history[k]!.bound).toBeLessThanOrEqual(out.history[k - 1]!.bound);
    expect(out.dual).toBeDefined();
    if (out.optimal) expect(out.score).toBeCloseTo(best, 9);
  });

  it('bundle: a warm start from the previous run begins at its bound', async () => {
    const r = lagrangianRoster(4);
    const compiled = compileRoster(r);
    const incumbent = { assignment: Array.from(greedyAssignment(compiled)), score: -Infinity, bound: Infinity, timeToBestMs: 0 };
    let t = 0;
    const first = await lagrangianSolver.solve({ compiled, incumbent }, { method: 'bundle', timeLimitMs: 400, clock: () => t++ });
    expect(first.dual).toBeDefined();
    // one oracle call at the warm start gives back the first run's best L
    const s = setup(r);
    const mu = new Float64Array(s.nMu);
    const nu = s.people.map((p) => new Float64Array(p.period.length));
    applyDual(s, first.dual!, mu, nu);
    const state = newBundleState(s, { mu, nu });
    bundleSteps(s, state, { deadline: Infinity, now: () => 0, maxIterations: 1 });
    expect(state.best).toBeCloseTo(first.bound, 6);
    // and the solver started there ends no higher
    let u = 0;
    const second = await lagrangianSolver.solve({ compiled, incumbent }, { method: 'bundle', timeLimitMs: 400, clock: () => u++, dualStart: first.dual });
    expect(second.bound).toBeLessThanOrEqual(first.bound + 1e-9);
  });
});
