/**
 * Explanations of a MAP result:
 * - concessions: every soft factor not at its own best value, with its cost, sorted;
 * - alternatives: for a variable, the next-best values from max-marginals and the
 *   score change if forced (max-marginals.ts, also behind the server's seat details);
 * - price of a concession: re-solve with the factor held at its best value and
 *   report the score change and which other factors give way.
 */
import type { Assignment, Factor, Model } from '../model/types';
import { factorScore, isHardFactor, keyOf, scopeOf, valueLabel, countingScoreAt } from '../model/factor-graph';
import { score } from '../model/score';
import { buildEngine, type Engine } from '../inference/engine';
import { exactTreeMap } from '../inference/exact';
import { dualPass, exactlySolvable, forcedValues } from './max-marginals';

export { dualPass, exactlySolvable, forcedValues, type ForcedValue } from './max-marginals';
import { solveMap, type MapResult } from '../inference/solve';
import { MAP_PRESETS, type MapOptions } from '../inference/options';

/** Largest score a factor can reach on its own (ignoring all other factors). */
export function factorBest(model: Model, f: Factor): number {
  const vars = model.variables;
  const maxOf = (t: ArrayLike<number>): number => {
    let m = -Infinity;
    for (let i = 0; i < t.length; i++) if (t[i]! > m) m = t[i]!;
    return m;
  };
  const sharedKeys = (a: number, b: number): boolean => {
    const ka = new Set<number>();
    for (let x = 0; x < vars[a]!.cardinality; x++) if (keyOf(vars[a]!, x) >= 0) ka.add(keyOf(vars[a]!, x));
    for (let x = 0; x < vars[b]!.cardinality; x++) if (ka.has(keyOf(vars[b]!, x))) return true;
    return false;
  };
  switch (f.kind) {
    case 'unary':
    case 'pairwise':
    case 'table':
      return maxOf(f.table);
    case 'sameKey':
      return f.weight > 0 && sharedKeys(f.a, f.b) ? f.weight : 0;
    case 'allDifferent':
      return 0;
    case 'sparsePair': {
      const ka = new Set<number>(), kb = new Set<number>();
      for (let x = 0; x < vars[f.a]!.cardinality; x++) ka.add(keyOf(vars[f.a]!, x));
      for (let x = 0; x < vars[f.b]!.cardinality; x++) kb.add(keyOf(vars[f.b]!, x));
      let best = -Infinity, listedPairs = 0;
      const seen = new Set<string>();
      for (const [a, b, s] of f.entries)
        if (ka.has(a) && kb.has(b) && !seen.has(`${a},${b}`)) {
          seen.add(`${a},${b}`);
          listedPairs++;
          if (s > best) best = s;
        }
      // the default applies if some pair of keys is not listed
      if (listedPairs < ka.size * kb.size && f.default > best) best = f.default;
      return best;
    }
    case 'counting': {
      // reachable sums by subset DP over each variable's weights (0 always possible unless every value weighs)
      let reach = new Set<number>([0]);
      f.vars.forEach((v, j) => {
        const ws = new Set<number>();
        const listed = new Map<number, number>();
        for (const [x, w] of f.weights[j]!) listed.set(x, (listed.get(x) ?? 0) + w);
        for (let x = 0; x < vars[v]!.cardinality; x++) ws.add(listed.get(x) ?? 0);
        const next = new Set<number>();
        for (const s of reach) for (const w of ws) next.add(s + w);
        reach = next;
      });
      let best = -Infinity;
      for (const s of reach) best = Math.max(best, countingScoreAt(f, s));
      return best;
    }
  }
}

export interface Concession {
  factor: number;
  id?: string;
  label?: string;
  kind: Factor['kind'];
  vars: number[];
  /** Score of the factor in the assignment. */
  score: number;
  /** Best score the factor could reach on its own. */
  best: number;
  /** best - score (> 0): points given up. */
  cost: number;
}

/** Soft factors not at their best, most costly first (ties by model order). */
export function concessions(model: Model, x: Assignment, minCost = 1e-9): Concession[] {
  const out: Concession[] = [];
  model.factors.forEach((f, i) => {
    if (isHardFactor(f)) return;
    const s = factorScore(model, f, x);
    if (s === -Infinity) return; // a broken hard part is not a concession
    const best = factorBest(model, f);
    if (best - s > minCost) out.push({ factor: i, id: f.id, label: f.label, kind: f.kind, vars: scopeOf(f), score: s, best, cost: best - s });
  });
  return out.sort((a, b) => b.cost - a.cost || a.factor - b.factor);
}

export interface Alternative {
  value: number;
  label: string;
  key: number;
  /** Score change if the variable is forced to this value (re-optimized as described by `how`). */
  delta: number;
  /** Upper bound on the score change (equal to delta when exact; Infinity when unknown). */
  deltaBound: number;
  /** 'exact': enumeration or tree max-marginals; 'repair': local re-optimization around the current answer (achievable, may understate). */
  how: 'exact' | 'repair';
}

export interface AlternativeOptions {
  /** A compiled engine of the same model, to reuse across calls (buildEngine(model)). */
  engine?: Engine;
  count: number;
  /** Time for repairing all values of one variable together. */
  repairMs: number;
  /** Time of the dual pass behind the upper bounds (loopy models only). */
  dualMs: number;
  seed: number;
}

/**
 * Next-best values of variable i from max-marginals (forcedValues in max-marginals.ts): exact on
 * tiny models and forests; otherwise each value forced and the answer repaired by local search
 * (achievable), with the dual max-marginal bound above it.
 */
export async function alternatives(model: Model, result: MapResult, i: number, options: Partial<AlternativeOptions> = {}): Promise<Alternative[]> {
  const o: AlternativeOptions = { count: 3, repairMs: 200, dualMs: 300, seed: 1, ...options };
  const v = model.variables[i]!;
  const engine = o.engine ?? buildEngine(model);
  const base = Int32Array.from(result.assignment);
  const dual = exactlySolvable(engine) ? null : await dualPass(model, base, o.dualMs);
  const forced = await forcedValues(model, engine, base, i, dual, { budgetMs: o.repairMs, seed: o.seed });
  return forced
    .filter((f) => f.score > -Infinity)
    .sort((p, q) => q.score - p.score || p.value - q.value)
    .slice(0, o.count)
    .map((f) => ({ value: f.value, label: valueLabel(v, f.value), key: keyOf(v, f.value), delta: f.score - result.score, deltaBound: f.bound - result.score, how: f.how }));
}

/** Alternatives for several variables, compiling the model once. */
export async function alternativesFor(model: Model, result: MapResult, vars: number[], options: Partial<AlternativeOptions> = {}): Promise<Map<number, Alternative[]>> {
  const engine = options.engine ?? buildEngine(model);
  const out = new Map<number, Alternative[]>();
  for (const i of vars) out.set(i, await alternatives(model, result, i, { ...options, engine }));
  return out;
}

/** Exact max-marginals on a forest (absolute scores). */
export function exactMaxMarginals(model: Model): Float64Array[] {
  const engine = buildEngine(model);
  const r = exactTreeMap(engine);
  // big-M values below the feasible range are impossible
  return r.maxMarginals.map((m) => m.map((s) => (s < r.best - engine.H / 2 ? -Infinity : s)));
}

/** A hard factor that allows only the combinations where factor f reaches at least `best`. */
export function enforceFactor(model: Model, f: Factor, best: number): Factor {
  const ok = (s: number): number => (s >= best - 1e-9 ? 0 : -Infinity);
  const meta = { id: `enforce:${f.id ?? f.kind}`, label: `honour ${f.label ?? f.id ?? f.kind}`, hard: true };
  switch (f.kind) {
    case 'unary':
      return { ...meta, kind: 'unary', v: f.v, table: Array.from(f.table, ok) };
    case 'pairwise':
      return { ...meta, kind: 'pairwise', a: f.a, b: f.b, table: Array.from(f.table, ok) };
    case 'table':
      return { ...meta, kind: 'table', vars: f.vars, table: Array.from(f.table, ok) };
    case 'allDifferent':
      return { ...meta, kind: 'allDifferent', vars: f.vars };
    case 'sameKey': {
      if (f.weight <= 0) return { ...meta, kind: 'allDifferent', vars: [f.a, f.b] };
      // same non-negative key required: a sparse table listing equal keys
      const va = model.variables[f.a]!, vb = model.variables[f.b]!;
      const kb = new Set<number>();
      for (let x = 0; x < vb.cardinality; x++) kb.add(keyOf(vb, x));
      const entries: Array<[number, number, number]> = [];
      for (let x = 0; x < va.cardinality; x++) {
        const k = keyOf(va, x);
        if (k >= 0 && kb.has(k)) entries.push([k, k, 0]);
      }
      return { ...meta, kind: 'sparsePair', a: f.a, b: f.b, entries, default: -Infinity };
    }
    case 'sparsePair':
      return { ...meta, kind: 'sparsePair', a: f.a, b: f.b, entries: f.entries.map(([a, b, s]) => [a, b, ok(s)]), default: ok(f.default) };
    case 'counting':
      return { ...meta, kind: 'counting', vars: f.vars, weights: f.weights, score: (s: number) => ok(countingScoreAt(f, s)) };
  }
}

export interface FactorChange {
  factor: number;
  id?: string;
  label?: string;
  before: number;
  after: number;
  change: number;
}

export interface ConcessionPrice {
  factor: number;
  /** False when no assignment honouring the factor was found (e.g. hard rules forbid it). */
  feasible: boolean;
  scoreBefore: number;
  scoreAfter: number;
  /** scoreAfter - scoreBefore (usually ≤ 0; > 0 means the original answer was not optimal). */
  change: number;
  /** Upper bound of the re-solve: the change can be at most bound - scoreBefore. */
  boundAfter: number;
  /** Other factors whose score drops, most first. */
  givesWay: FactorChange[];
  /** Other factors whose score rises. */
  gains: FactorChange[];
  assignment: number[];
  optimal: boolean;
}

/** Re-solve with factor fi held at its best value; report the change and who gives way. */
export async function priceOfConcession(model: Model, before: Assignment, fi: number, options: Partial<MapOptions> = {}, signal?: AbortSignal): Promise<ConcessionPrice> {
  const f = model.factors[fi]!;
  const best = factorBest(model, f);
  const enforced: Model = { ...model, factors: [...model.factors, enforceFactor(model, f, best)] };
  const r = await solveMap(enforced, { ...MAP_PRESETS.concessionPrice, ...options, initial: options.initial ?? Array.from(before) }, signal);
  const scoreBefore = score(model, before);
  const changes: FactorChange[] = [];
  if (r.feasible)
    model.factors.forEach((g, j) => {
      if (j === fi) return;
      const b = factorScore(model, g, before), a = factorScore(model, g, r.assignment);
      if (Math.abs(a - b) > 1e-9) changes.push({ factor: j, id: g.id, label: g.label, before: b, after: a, change: a - b });
    });
  return {
    factor: fi,
    feasible: r.feasible,
    scoreBefore,
    scoreAfter: r.score,
    change: r.score - scoreBefore,
    boundAfter: r.bound,
    givesWay: changes.filter((c) => c.change < 0).sort((p, q) => p.change - q.change),
    gains: changes.filter((c) => c.change > 0).sort((p, q) => q.change - p.change),
    assignment: r.assignment,
    optimal: r.optimal,
  };
}
