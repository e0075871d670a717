// Explanations against exact enumeration: concession costs against each factor's own
// best (enumerated over its scope here), prices against the best assignment that
// honours the factor (enumerated), alternatives against exact max-marginals.
import { describe, expect, it } from 'vitest';
import { factorScore, isHardFactor, score, scopeOf, type Model } from '../../../solver/model';
import { enumerateModel, solveMapSync } from '../../../solver/inference';
import { alternatives, concessions, priceOfConcession } from '../../../solver/explain';
import { allAssignments, makeRandomModel } from '../helpers/models';

/** Best score of factor fi over all assignments of its scope (others irrelevant). */
function ownBest(m: Model, fi: number): number {
  const f = m.factors[fi]!;
  const scope = scopeOf(f);
  const sub: Model = { variables: scope.map((v) => m.variables[v]!), factors: [] };
  let best = -Infinity;
  for (const y of allAssignments(sub)) {
    const x = new Array<number>(m.variables.length).fill(0);
    scope.forEach((v, j) => (x[v] = y[j]!));
    best = Math.max(best, factorScore(m, f, x));
  }
  return best;
}

describe('concessions', () => {
  it('lists every soft factor below its own best, with cost = best − score, most costly first', () => {
    for (let seed = 1; seed <= 6; seed++) {
      const m = makeRandomModel({ seed, n: 7, k: 3, edges: 10, kinds: ['pairwise', 'sameKey', 'sparsePair', 'softAllDifferent'] });
      const r = solveMapSync(m);
      if (!r.feasible) continue;
      const list = concessions(m, r.assignment);
      const expected = m.factors
        .map((f, i) => ({ i, hard: isHardFactor(f), s: factorScore(m, f, r.assignment), best: ownBest(m, i) }))
        .filter((e) => !e.hard && e.s > -Infinity && e.best - e.s > 1e-9);
      expect(list.map((c) => c.factor).sort((a, b) => a - b)).toEqual(expected.map((e) => e.i));
      for (const c of list) expect(c.cost).toBeCloseTo(expected.find((e) => e.i === c.factor)!.best - c.score, 9);
      for (let j = 1; j < list.length; j++) expect(list[j - 1]!.cost).toBeGreaterThanOrEqual(list[j]!.cost);
    }
  });
});

describe('price of honouring a concession', () => {
  it('equals the best score among assignments where the factor is at its best (enumerated), and names who gives way', async () => {
    let checked = 0;
    for (let seed = 1; seed <= 8 && checked < 6; seed++) {
      const m = makeRandomModel({ seed, n: 7, k: 3, edges: 9, kinds: ['pairwise', 'sameKey', 'sparsePair', 'softAllDifferent'] });
      const r = solveMapSync(m);
      if (!r.feasible) continue;
      const c = concessions(m, r.assignment)[0];
      if (!c) continue;
      let best = -Infinity;
      for (const x of allAssignments(m)) if (factorScore(m, m.factors[c.factor]!, x) >= c.best - 1e-9) best = Math.max(best, score(m, x));
      const p = await priceOfConcession(m, r.assignment, c.factor, { timeLimitMs: 3_000 });
      if (best === -Infinity) {
        expect(p.feasible).toBe(false);
        continue;
      }
      expect(p.feasible).toBe(true);
      expect(p.scoreAfter).toBeCloseTo(best, 8);
      expect(p.change).toBeCloseTo(best - r.score, 8);
      expect(p.change).toBeLessThanOrEqual(1e-9); // r is optimal, so honouring costs something or nothing
      // the factor itself gains exactly its cost; the others' changes account for the rest
      const others = [...p.givesWay, ...p.gains].reduce((a, g) => a + g.change, 0);
      expect(others + c.cost).toBeCloseTo(p.change, 8);
      for (const g of p.givesWay) expect(g.after).toBeLessThan(g.before);
      checked++;
    }
    expect(checked).toBeGreaterThan(2);
  });
});

describe('alternatives from max-marginals', () => {
  it('on tiny models: next-best values and exact score changes (against enumeration)', async () => {
    const m = makeRandomModel({ seed: 9, n: 6, k: 4, edges: 8 });
    const r = solveMapSync(m);
    const e = enumerateModel(m);
    for (let i = 0; i < 6; i++) {
      const alts = await alternatives(m, r, i, { count: 2 });
      const mm = Array.from(e.maxMarginals[i]!);
      const ranked = mm.map((v, x) => [v, x] as const).filter(([v, x]) => x !== r.assignment[i] && v > -Infinity).sort((a, b) => b[0] - a[0] || a[1] - b[1]);
      expect(alts.map((a) => a.value)).toEqual(ranked.slice(0, 2).map((p) => p[1]));
      alts.forEach((a) => expect(a.delta).toBeCloseTo(mm[a.value]! - e.score, 9));
    }
  });

  it('on loopy models too large to enumerate: forced repairs are feasible, never better than the optimum, within the dual bound', async () => {
    const m = makeRandomModel({ seed: 12, n: 14, k: 4, edges: 25, hardDensity: 0.02 });
    const r = solveMapSync(m, { enumerationLimit: 1 });
    expect(r.optimal).toBe(true);
    for (const i of [0, 5, 9]) {
      for (const a of await alternatives(m, r, i, { count: 3 })) {
        expect(a.how).toBe('repair');
        expect(a.delta).toBeLessThanOrEqual(1e-9);
        expect(a.delta).toBeLessThanOrEqual(a.deltaBound + 1e-7);
        const x = [...r.assignment];
        x[i] = a.value;
        expect(Number.isFinite(a.delta)).toBe(true);
      }
    }
  });
});
