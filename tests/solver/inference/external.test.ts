// Checks against solvers and results from outside the project:
// - javascript-lp-solver (npm), an independent MILP solver, on random models of tens of variables;
// - munkres-js (npm), the Hungarian algorithm, on assignment-structured models;
// - the closed-form partition function of the periodic Ising chain (Baxter, ch. 3).
import { describe, expect, it } from 'vitest';
import computeMunkres from 'munkres-js';
import { score, type Factor, type Model } from '../../../solver/model';
import { computeMarginals, enumerateModel, solveMapSync } from '../../../solver/inference';
import { ilpOptimum } from '../../../solver/bench/ilp';
import { makeRandomModel, prng } from '../helpers/models';

describe('against javascript-lp-solver (MILP) on random models of tens of variables', () => {
  it('binary and ternary mixed models, 20–30 variables: the same optimum score', () => {
    const cases = [
      { seed: 101, n: 20, k: 2, edges: 35 },
      { seed: 102, n: 24, k: 2, edges: 45 },
      { seed: 103, n: 20, k: 3, edges: 28 },
      { seed: 104, n: 30, k: 2, edges: 50 },
    ];
    for (const c of cases) {
      const m = makeRandomModel({ ...c, kinds: ['pairwise', 'sameKey', 'sparsePair', 'allDifferent2'], counting: true, nary: true, hardDensity: 0.05 });
      const ilp = ilpOptimum(m, 60_000);
      const r = solveMapSync(m, { timeLimitMs: 30_000, seed: 1 });
      expect(ilp.feasible).toBe(r.feasible);
      if (!ilp.feasible) continue;
      // the LP solver reports its objective rounded; its assignment is scored exactly
      expect(r.score).toBeCloseTo(score(m, ilp.assignment), 6);
      expect(r.score).toBeCloseTo(ilp.score, 5);
      expect(r.bound).toBeGreaterThanOrEqual(r.score);
    }
  }, 120_000);

  it('a frustrated spin glass of 40 spins: the same optimum score', () => {
    const r0 = prng(7);
    const n = 40;
    const variables = Array.from({ length: n }, (_, i) => ({ name: `s${i}`, cardinality: 2 }));
    const factors: Factor[] = [];
    for (let i = 0; i < n; i++) factors.push({ kind: 'unary', v: i, table: [0, r0() - 0.5] });
    for (let a = 0; a < n; a++)
      for (let b = a + 1; b < n; b++)
        if (r0() < 0.08) {
          const J = r0() * 2 - 1;
          factors.push({ kind: 'pairwise', a, b, table: [J, -J, -J, J] });
        }
    const m: Model = { variables, factors };
    const ilp = ilpOptimum(m, 60_000);
    const r = solveMapSync(m, { timeLimitMs: 30_000 });
    expect(r.score).toBeCloseTo(score(m, ilp.assignment), 6);
  }, 120_000);
});

describe('against munkres-js (Hungarian algorithm) on assignment-structured models', () => {
  it('unary scores + one all-different over all variables: the same optimum', () => {
    for (const [seed, n, k] of [[1, 6, 6], [2, 9, 9], [3, 8, 12], [4, 12, 12]] as const) {
      const r0 = prng(seed);
      const scores = Array.from({ length: n }, () => Array.from({ length: k }, () => Math.round(r0() * 1000) / 100));
      const m: Model = {
        variables: Array.from({ length: n }, (_, i) => ({ name: `task${i}`, cardinality: k })),
        factors: [...scores.map((row, i): Factor => ({ kind: 'unary', v: i, table: row })), { kind: 'allDifferent', vars: Array.from({ length: n }, (_, i) => i) }],
      };
      // munkres minimizes cost: cost = max - score
      const max = Math.max(...scores.flat());
      const pairs = computeMunkres(scores.map((row) => row.map((s) => max - s))) as Array<[number, number]>;
      const hungarian = pairs.reduce((a, [i, j]) => a + scores[i]![j]!, 0);
      const r = solveMapSync(m, { timeLimitMs: 30_000 });
      expect(r.feasible).toBe(true);
      expect(r.score).toBeCloseTo(hungarian, 9);
      expect(new Set(r.assignment).size).toBe(n);
    }
  }, 120_000);

  it('seats with keyed people and an open value (key -1) that may repeat', () => {
    const r0 = prng(21);
    const seats = 7, people = 5;
    // values 0..4 are people (keys 0..4), value 5 is "open" (key -1, score 0 and may repeat)
    const scores = Array.from({ length: seats }, () => Array.from({ length: people }, () => Math.round(r0() * 600 - 100) / 100));
    const m: Model = {
      variables: Array.from({ length: seats }, (_, i) => ({ name: `seat${i}`, cardinality: people + 1, keys: [0, 1, 2, 3, 4, -1] })),
      factors: [...scores.map((row, i): Factor => ({ kind: 'unary', v: i, table: [...row, 0] })), { kind: 'allDifferent', vars: Array.from({ length: seats }, (_, i) => i) }],
    };
    // Hungarian on a square matrix: people plus one dummy "open" column per seat
    const big = Math.max(...scores.flat(), 0) + 1;
    const cost = scores.map((row) => [...row.map((s) => big - s), ...Array.from({ length: seats }, () => big)]);
    while (cost.length < people + seats) cost.push(Array.from({ length: people + seats }, () => 0));
    const pairs = computeMunkres(cost) as Array<[number, number]>;
    const hungarian = pairs.filter(([i, j]) => i < seats && j < people).reduce((a, [i, j]) => a + scores[i]![j]!, 0);
    const r = solveMapSync(m, { timeLimitMs: 5_000 });
    expect(r.score).toBeCloseTo(hungarian, 9);
  });
});

describe('periodic Ising chain against the closed form (Baxter, Exactly Solved Models in Statistical Mechanics, 1982, ch. 3; from memory)', () => {
  // Z = (2 cosh βJ)^N + (2 sinh βJ)^N at zero field, spins s = ±1, score(s) = βJ Σ_i s_i s_{i+1} (ring).
  const ring = (N: number, K: number): Model => ({
    variables: Array.from({ length: N }, (_, i) => ({ name: `s${i}`, cardinality: 2 })),
    factors: Array.from({ length: N }, (_, i): Factor => ({ kind: 'pairwise', a: i, b: (i + 1) % N, table: [K, -K, -K, K] })),
  });
  const closed = (N: number, K: number) => Math.log(Math.pow(2 * Math.cosh(K), N) + Math.pow(2 * Math.sinh(K), N));

  it('exact enumeration matches Z for rings of 3–14 spins, ferro- and antiferromagnetic', () => {
    for (const N of [3, 4, 7, 10, 14])
      for (const K of [0.3, 1.1, -0.8]) {
        expect(enumerateModel(ring(N, K)).logZ).toBeCloseTo(closed(N, K), 9);
        expect(computeMarginals(ring(N, K)).logZ).toBeCloseTo(closed(N, K), 9);
      }
  });

  it('loopy sum-product (Bethe, labelled approximate) on a 60-spin ring: error within the (tanh βJ)^N loop term', () => {
    for (const K of [0.4, 0.9]) {
      const res = computeMarginals(ring(60, K), { enumerationLimit: 1 });
      expect(res.exact).toBe(false);
      expect(res.method).toBe('loopy-bethe');
      // Bethe gives N log(2 cosh βJ); the exact value adds log(1 + tanh^N βJ)
      const missing = Math.log1p(Math.pow(Math.tanh(K), 60));
      expect(Math.abs(res.logZ - closed(60, K))).toBeLessThanOrEqual(missing + 1e-6);
      res.marginals.forEach((p) => expect(p[0]).toBeCloseTo(0.5, 6));
    }
  });
});
