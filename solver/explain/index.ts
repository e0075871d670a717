/**
 * Explanations of a MAP result:
 * - concessions: every soft factor not at its own best value, with its cost, sorted;
 * - alternatives: for a variable, the next-best values from max-marginals and the
 *   score change if forced;
 * - price of a concession: re-solve with the factor held at its best value and
 *   report the score change and which other factors give way.
 */
import type { Assignment, Factor, Model } from '../model/types';
import { factorScore, isHardFactor, keyOf, scopeOf, valueLabel, countingScoreAt } from '../model/factor-graph';
import { score } from '../model/score';
import { buildEngine, isForest, log10States, type Engine } from '../inference/engine';
import { enumerateModel, exactTreeMap } from '../inference/exact';
import { LocalSearch, rng } from '../inference/local-search';
import { solveMap, type MapResult } from '../inference/solve';
import type { MapOptions } from '../inference/options';

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
  /** Upper bound on the score change from the max-marginal (dual) when not exact. */
  deltaBound: number;
  /** 'exact': enumeration or tree max-marginals; 'repair': local re-optimization around the current answer (achievable, may understate). */
  how: 'exact' | 'repair';
}

export interface AlternativeOptions {
  /** A compiled engine of the same model, to reuse across calls (buildEngine(model)). */
  engine?: Engine;
  count: number;
  /** Time for each local repair. */
  repairMs: number;
  seed: number;
}

/**
 * Next-best values of variable i. Exact max-marginals on tiny models (enumeration)
 * and forests; otherwise candidates ranked by the dual max-marginal bound
 * bound − max b_i + b_i(v), each forced and repaired by local search to give an
 * achievable score change.
 */
export function alternatives(model: Model, result: MapResult, i: number, options: Partial<AlternativeOptions> = {}): Alternative[] {
  const o: AlternativeOptions = { count: 3, repairMs: 200, seed: 1, ...options };
  const v = model.variables[i]!;
  const cur = result.assignment[i]!;
  const E = o.engine ?? buildEngine(model);
  const mk = (value: number, delta: number, deltaBound: number, how: Alternative['how']): Alternative => ({ value, label: valueLabel(v, value), key: keyOf(v, value), delta, deltaBound, how });
  if (log10States(E) <= 5.3 || isForest(E)) {
    const mm = log10States(E) <= 5.3 ? enumerateModel(model).maxMarginals[i]! : exactMaxMarginals(model)[i]!;
    const best = Math.max(...mm);
    return Array.from(mm.keys())
      .filter((x) => x !== cur && mm[x]! > -Infinity)
      .sort((a, b) => mm[b]! - mm[a]! || a - b)
      .slice(0, o.count)
      .map((x) => mk(x, mm[x]! - best, mm[x]! - best, 'exact'));
  }
  const b = result.beliefs?.[i];
  const bmax = b ? Math.max(...b) : 0;
  const ub = (x: number): number => (b ? result.bound - bmax + b[x]! - result.score : Infinity);
  const cands = Array.from({ length: v.cardinality }, (_, x) => x)
    .filter((x) => x !== cur)
    .sort((p, q) => ub(q) - ub(p) || p - q)
    .slice(0, Math.max(o.count * 3, o.count));
  const fixed = new Uint8Array(E.n);
  fixed[i] = 1;
  const res: Alternative[] = [];
  for (const x of cands) {
    const start = Int32Array.from(result.assignment);
    start[i] = x;
    const ls = new LocalSearch(E, start, rng(o.seed), fixed);
    ls.run(Date.now() + o.repairMs);
    const s = score(model, ls.x);
    if (s === -Infinity) continue;
    res.push(mk(x, s - result.score, ub(x), 'repair'));
  }
  return res.sort((p, q) => q.delta - p.delta || p.value - q.value).slice(0, o.count);
}

/** Alternatives for several variables, compiling the model once. */
export function alternativesFor(model: Model, result: MapResult, vars: number[], options: Partial<AlternativeOptions> = {}): Map<number, Alternative[]> {
  const engine = options.engine ?? buildEngine(model);
  return new Map(vars.map((i) => [i, alternatives(model, result, i, { ...options, engine })]));
}

/** Exact max-marginals on a forest (absolute scores). */
export function exactMaxMarginals(model: Model): Float64Array[] {
  const E = buildEngine(model);
  const r = exactTreeMap(E);
  // big-M values below the feasible range are impossible
  return r.maxMarginals.map((m) => m.map((s) => (s < r.best - E.H / 2 ? -Infinity : s)));
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
  const r = await solveMap(enforced, { timeLimitMs: 2_000, ...options, initial: options.initial ?? Array.from(before) }, signal);
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
