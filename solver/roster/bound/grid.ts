/**
 * The score grid and the ideal of a model.
 *
 * Grid: every finite factor value is a multiple of some step g (the gcd of the points, e.g. 0.5
 * when weights are whole and contracted-hours deviations count half points), so every roster's
 * score lies on constant + g·ℤ. A bound B can then be rounded down to that grid:
 *   ⌊B⌋_g = constant + g·⌊(B − constant)/g⌋,
 * and a roster scoring ⌊B⌋_g is proven best.
 *
 * Ideal: the score if every factor were at its own best (cost-function-network convention:
 * cost 0 = every factor at its best). Concessions of a roster = ideal − score ≥ 0; a bound B
 * says no roster concedes fewer than ideal − B.
 */
import type { Factor, Model } from '../../model/types';
import { countingMaxSum, countingScoreAt } from '../../model/factor-graph';
import { termOf, type CompiledRoster } from '../compile';
import type { TermName } from '../score-roster';

/** Denominators tried for the grid (points are entered with at most a few decimals). */
const DENOMINATORS = [1, 2, 4, 5, 8, 10, 20, 25, 40, 50, 100, 200, 1000];

function gcd(a: number, b: number): number {
  while (b) [a, b] = [b, a % b];
  return a;
}

/** Finite values a factor can contribute (for counting factors: every reachable sum's score). */
function factorValues(f: Factor): number[] {
  switch (f.kind) {
    case 'unary':
    case 'pairwise':
    case 'table':
      return Array.from(f.table as ArrayLike<number>);
    case 'sameKey':
      return [0, f.weight];
    case 'sparsePair':
      return [f.default, ...f.entries.map((e) => e[2])];
    case 'allDifferent':
      return [0, f.penalty ?? -Infinity];
    case 'counting': {
      const n = Math.min(countingMaxSum(f), typeof f.score === 'function' ? 10_000 : f.score.length - 1);
      const out: number[] = [];
      for (let t = 0; t <= n; t++) out.push(countingScoreAt(f, t));
      return out;
    }
  }
}

/** Step g of the score grid (0 when no small denominator makes every value whole). */
export function scoreGrid(model: Model): number {
  const values: number[] = [];
  for (const f of model.factors) for (const v of factorValues(f)) if (Number.isFinite(v) && v !== 0) values.push(v);
  if (!values.length) return 1;
  for (const d of DENOMINATORS) {
    let g = 0;
    let ok = true;
    for (const v of values) {
      const k = Math.round(v * d);
      if (Math.abs(k - v * d) > 1e-7 * Math.max(1, Math.abs(v * d))) {
        ok = false;
        break;
      }
      g = gcd(g, Math.abs(k));
    }
    if (ok && g > 0) return g / d;
  }
  return 0;
}

/** The bound rounded down to the score grid (unchanged without a grid). */
export function roundToGrid(bound: number, model: Model, step = scoreGrid(model)): number {
  if (!(step > 0) || !Number.isFinite(bound)) return bound;
  const c = model.constant ?? 0;
  return c + step * Math.floor((bound - c) / step + 1e-9);
}

/** Best finite value of one factor over its reachable values (0 for hard-only factors). */
function factorBest(f: Factor): number {
  let m = -Infinity;
  for (const v of factorValues(f)) if (Number.isFinite(v) && v > m) m = v;
  return m === -Infinity ? 0 : m;
}

/** The ideal per term (same names as scoreRoster's terms) and in total. */
export function rosterIdeal(compiled: CompiledRoster): { total: number; terms: Record<TermName, number> } {
  const terms = { ...compiled.termConstants };
  compiled.model.factors.forEach((f, i) => {
    const split = compiled.parts[i];
    if (split && f.kind === 'counting') {
      // merged factors: each term at its own best
      const n = countingMaxSum(f);
      for (const p of split) {
        let m = -Infinity;
        for (let t = 0; t <= Math.min(n, p.table.length - 1); t++) if (Number.isFinite(p.table[t]!) && p.table[t]! > m) m = p.table[t]!;
        terms[p.term] += m === -Infinity ? 0 : m;
      }
    } else terms[termOf(f)] += factorBest(f);
  });
  const total = Object.values(terms).reduce((a, b) => a + b, 0);
  return { total, terms };
}
