// Checks against exact enumeration: every optimum, bound, max-marginal, marginal and
// log Z below is compared with a brute-force loop over all assignments written here,
// scoring each with the model's own definition (solver/model score()).
import { describe, expect, it } from 'vitest';
import { score } from '../../../solver/model';
import { computeMarginals, enumerateModel, solveMapSync } from '../../../solver/inference';
import { exactMaxMarginals } from '../../../solver/explain';
import { allAssignments, makeRandomModel, makeRandomTree } from '../helpers/models';
import type { Model } from '../../../solver/model';

function bruteForce(model: Model) {
  let best = -Infinity;
  const mm = model.variables.map((v) => new Array<number>(v.cardinality).fill(-Infinity));
  const scores: Array<[number[], number]> = [];
  for (const x of allAssignments(model)) {
    const s = score(model, x);
    scores.push([x, s]);
    if (s > best) best = s;
    x.forEach((v, i) => {
      if (s > mm[i]![v]!) mm[i]![v] = s;
    });
  }
  const m = best;
  let z = 0;
  for (const [, s] of scores) if (s > -Infinity) z += Math.exp(s - m);
  const logZ = m === -Infinity ? -Infinity : m + Math.log(z);
  const marg = model.variables.map((v) => new Array<number>(v.cardinality).fill(0));
  for (const [x, s] of scores) if (s > -Infinity) x.forEach((v, i) => (marg[i]![v]! += Math.exp(s - logZ)));
  return { best, mm, logZ, marg };
}

describe('exact enumeration (against a brute-force loop over score())', () => {
  it('enumerateModel gives the optimum, max-marginals, log Z and marginals', () => {
    for (let seed = 1; seed <= 8; seed++) {
      const m = makeRandomModel({ seed, n: 6, k: 3 });
      const bf = bruteForce(m);
      const e = enumerateModel(m);
      expect(e.score).toBeCloseTo(bf.best, 9);
      expect(score(m, e.assignment)).toBeCloseTo(bf.best, 9);
      e.maxMarginals.forEach((row, i) => row.forEach((v, x) => (bf.mm[i]![x] === -Infinity ? expect(v).toBe(-Infinity) : expect(v).toBeCloseTo(bf.mm[i]![x]!, 9))));
      expect(e.logZ).toBeCloseTo(bf.logZ, 9);
      e.marginals.forEach((row, i) => row.forEach((p, x) => expect(p).toBeCloseTo(bf.marg[i]![x]!, 9)));
    }
  });
});

describe('MAP by message passing on loopy models (against exact enumeration)', () => {
  it('MPLP + decoding + branch and bound finds the optimum and a valid bound on random mixed models', () => {
    let infeasible = 0;
    for (let seed = 1; seed <= 20; seed++) {
      const m = makeRandomModel({ seed, n: 8, k: 3, edges: 12, kinds: ['pairwise', 'sameKey', 'sparsePair', 'allDifferent2', 'softAllDifferent'] });
      const bf = bruteForce(m);
      // enumerationLimit 1 forces the message-passing path
      const r = solveMapSync(m, { enumerationLimit: 1, timeLimitMs: 20_000, seed });
      expect(r.method).not.toBe('enumerate');
      if (bf.best === -Infinity) {
        infeasible++;
        expect(r.feasible).toBe(false);
        continue;
      }
      expect(r.feasible).toBe(true);
      expect(r.score).toBeCloseTo(bf.best, 7);
      expect(score(m, r.assignment)).toBeCloseTo(r.score, 9);
      expect(r.bound).toBeGreaterThanOrEqual(bf.best - 1e-7);
      expect(r.optimal).toBe(true);
    }
    expect(infeasible).toBeLessThan(20); // the family is mostly feasible
  });

  it('the MPLP bound alone (no branch and bound) never falls below the optimum', () => {
    for (let seed = 40; seed <= 55; seed++) {
      const m = makeRandomModel({ seed, n: 8, k: 3, edges: 14 });
      const bf = bruteForce(m);
      const r = solveMapSync(m, { enumerationLimit: 1, branchAndBoundMaxVars: 0, timeLimitMs: 300, maxIterations: 40, seed });
      expect(r.bound).toBeGreaterThanOrEqual(bf.best - 1e-7);
      expect(r.score).toBeLessThanOrEqual(bf.best + 1e-9);
    }
  });

  it('damped loopy max-product returns a feasible score at most the optimum and a valid bound', () => {
    for (let seed = 60; seed <= 70; seed++) {
      const m = makeRandomModel({ seed, n: 7, k: 3, edges: 9, hardDensity: 0 });
      const bf = bruteForce(m);
      const r = solveMapSync(m, { method: 'maxProduct', enumerationLimit: 1, timeLimitMs: 300, maxIterations: 60, damping: 0.5, seed });
      expect(r.method).toBe('maxProduct');
      expect(r.score).toBeLessThanOrEqual(bf.best + 1e-9);
      expect(r.bound).toBeGreaterThanOrEqual(bf.best - 1e-7);
      expect(r.score).toBeGreaterThan(-Infinity);
    }
  });
});

describe('exact on trees and chains (against exact enumeration)', () => {
  it('MAP, max-marginals, log Z and marginals are exact on random trees', () => {
    for (let seed = 1; seed <= 12; seed++) {
      const m = makeRandomTree({ seed, n: 8, k: 3 });
      const bf = bruteForce(m);
      const r = solveMapSync(m, { enumerationLimit: 1 });
      expect(r.method).toBe('tree');
      expect(r.score).toBeCloseTo(bf.best, 9);
      expect(r.optimal).toBe(true);
      const mm = exactMaxMarginals(m);
      mm.forEach((row, i) => row.forEach((v, x) => (bf.mm[i]![x] === -Infinity ? expect(v).toBe(-Infinity) : expect(v).toBeCloseTo(bf.mm[i]![x]!, 8))));
      const mg = computeMarginals(m, { enumerationLimit: 1 });
      expect(mg.method).toBe('tree');
      expect(mg.exact).toBe(true);
      expect(mg.logZ).toBeCloseTo(bf.logZ, 9);
      mg.marginals.forEach((row, i) => row.forEach((p, x) => expect(p).toBeCloseTo(bf.marg[i]![x]!, 9)));
    }
  });

  it('a tree with a counting factor node (n-ary) is solved exactly', () => {
    for (let seed = 1; seed <= 6; seed++) {
      const m = makeRandomModel({ seed, n: 7, k: 3, edges: 0, counting: true, nary: false });
      // chain the remaining variables to the counting factor's scope: still a tree
      m.factors.push({ kind: 'sameKey', a: 3, b: 4, weight: 1.1 }, { kind: 'pairwise', a: 4, b: 5, table: [1, -1, 0.5, 0, 2, -Infinity, 0.3, 0.3, 0.3] }, { kind: 'allDifferent', vars: [5, 6] });
      const bf = bruteForce(m);
      const r = solveMapSync(m, { enumerationLimit: 1 });
      expect(r.method).toBe('tree');
      expect(r.score).toBeCloseTo(bf.best, 9);
      const mg = computeMarginals(m, { enumerationLimit: 1 });
      expect(mg.logZ).toBeCloseTo(bf.logZ, 8);
    }
  });

  it('a long chain: max-product equals sum-product-free dynamic programming written here', () => {
    const n = 60, k = 4;
    const m = makeRandomTree({ seed: 99, n: 2, k });
    m.variables = Array.from({ length: n }, (_, i) => ({ name: `c${i}`, cardinality: k }));
    m.factors = [];
    const r0 = (i: number, x: number) => Math.sin(i * 7 + x * 3);
    const p0 = (i: number, a: number, b: number) => Math.cos(i + a * 2 - b);
    for (let i = 0; i < n; i++) m.factors.push({ kind: 'unary', v: i, table: Array.from({ length: k }, (_, x) => r0(i, x)) });
    for (let i = 0; i + 1 < n; i++) m.factors.push({ kind: 'pairwise', a: i, b: i + 1, table: Array.from({ length: k * k }, (_, e) => p0(i, Math.floor(e / k), e % k)) });
    // Viterbi written independently
    let f = Array.from({ length: k }, (_, x) => r0(0, x));
    for (let i = 1; i < n; i++) f = Array.from({ length: k }, (_, b) => Math.max(...f.map((v, a) => v + p0(i - 1, a, b))) + r0(i, b));
    const r = solveMapSync(m);
    expect(r.method).toBe('tree');
    expect(r.score).toBeCloseTo(Math.max(...f), 9);
  });
});

describe('loopy sum-product', () => {
  it('is labelled approximate and stays near the exact marginals on weakly coupled models', () => {
    const m = makeRandomModel({ seed: 5, n: 8, k: 2, edges: 10, kinds: ['sameKey'], counting: false, nary: false, hardDensity: 0 });
    for (const f of m.factors) if (f.kind === 'sameKey') f.weight = Number.isFinite(f.weight) ? f.weight * 0.2 : 0.1;
    const bf = bruteForce(m);
    const mg = computeMarginals(m, { enumerationLimit: 1 });
    expect(mg.method).toBe('loopy-bethe');
    expect(mg.exact).toBe(false);
    expect(Math.abs(mg.logZ - bf.logZ)).toBeLessThan(0.05);
    mg.marginals.forEach((row, i) => row.forEach((p, x) => expect(Math.abs(p - bf.marg[i]![x]!)).toBeLessThan(0.05)));
  });
});
