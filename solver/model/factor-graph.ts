/**
 * Factor-graph structure of a model: scopes, validation, keys and per-factor
 * scoring. No inference lives here.
 */
import type { Assignment, CountingFactor, Factor, Model, Variable } from './types';

/** Thrown for a model that breaks the rules in types.ts. */
export class ModelError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'ModelError';
  }
}

/** Variables a factor touches, in the factor's own order. */
export function scopeOf(f: Factor): number[] {
  switch (f.kind) {
    case 'unary':
      return [f.v];
    case 'pairwise':
    case 'sameKey':
    case 'sparsePair':
      return [f.a, f.b];
    case 'allDifferent':
    case 'counting':
    case 'table':
      return f.vars;
  }
}

/** Key of value x of variable v (value index when the variable has no keys). */
export function keyOf(v: Variable, x: number): number {
  return v.keys ? v.keys[x]! : x;
}

/** Largest key used by any variable (-1 if none). */
export function maxKey(model: Model): number {
  let m = -1;
  for (const v of model.variables) {
    if (v.keys) {
      for (let x = 0; x < v.cardinality; x++) if (v.keys[x]! > m) m = v.keys[x]!;
    } else if (v.cardinality - 1 > m) m = v.cardinality - 1;
  }
  return m;
}

/** Sum of the largest weight of each variable: the largest reachable count. */
export function countingMaxSum(f: CountingFactor): number {
  let s = 0;
  for (const w of f.weights) {
    let m = 0;
    for (const [, wt] of w) if (wt > m) m = wt;
    s += m;
  }
  return s;
}

/** Score of a counting factor at sum s. */
export function countingScoreAt(f: CountingFactor, s: number): number {
  if (typeof f.score === 'function') return f.score(s);
  const t = f.score;
  if (t.length === 0) return 0;
  return s < t.length ? t[s]! : t[t.length - 1]!;
}

/** Check a model's shape; throws ModelError naming the offending part. */
export function validateModel(model: Model): void {
  const n = model.variables.length;
  model.variables.forEach((v, i) => {
    if (!Number.isInteger(v.cardinality) || v.cardinality < 1)
      throw new ModelError(`variable ${i} (${v.name}): cardinality must be a positive integer`);
    if (v.keys && v.keys.length !== v.cardinality)
      throw new ModelError(`variable ${i} (${v.name}): keys length ${v.keys.length} != cardinality ${v.cardinality}`);
    if (v.labels && v.labels.length !== v.cardinality)
      throw new ModelError(`variable ${i} (${v.name}): labels length ${v.labels.length} != cardinality ${v.cardinality}`);
  });
  const card = (i: number, fi: number): number => {
    if (!Number.isInteger(i) || i < 0 || i >= n) throw new ModelError(`factor ${fi}: variable index ${i} out of range`);
    return model.variables[i]!.cardinality;
  };
  model.factors.forEach((f, fi) => {
    const name = `factor ${fi}${f.id ? ` (${f.id})` : ''}`;
    const scope = scopeOf(f);
    const sizes = scope.map((v) => card(v, fi));
    switch (f.kind) {
      case 'unary':
        if (f.table.length !== sizes[0]) throw new ModelError(`${name}: unary table length ${f.table.length} != ${sizes[0]}`);
        break;
      case 'pairwise':
        if (f.a === f.b) throw new ModelError(`${name}: pairwise factor needs two different variables`);
        if (f.table.length !== sizes[0]! * sizes[1]!)
          throw new ModelError(`${name}: pairwise table length ${f.table.length} != ${sizes[0]! * sizes[1]!}`);
        break;
      case 'table': {
        const size = sizes.reduce((a, b) => a * b, 1);
        if (f.table.length !== size) throw new ModelError(`${name}: table length ${f.table.length} != ${size}`);
        if (new Set(f.vars).size !== f.vars.length) throw new ModelError(`${name}: repeated variable in scope`);
        break;
      }
      case 'sameKey':
      case 'sparsePair':
        if (f.a === f.b) throw new ModelError(`${name}: needs two different variables`);
        break;
      case 'allDifferent':
        if (new Set(f.vars).size !== f.vars.length) throw new ModelError(`${name}: repeated variable in scope`);
        break;
      case 'counting':
        if (f.weights.length !== f.vars.length) throw new ModelError(`${name}: weights must have one list per variable`);
        if (new Set(f.vars).size !== f.vars.length) throw new ModelError(`${name}: repeated variable in scope`);
        f.weights.forEach((ws, j) => {
          for (const [x, w] of ws) {
            if (!Number.isInteger(x) || x < 0 || x >= sizes[j]!) throw new ModelError(`${name}: value ${x} out of range for variable ${f.vars[j]}`);
            if (!Number.isInteger(w) || w < 0) throw new ModelError(`${name}: weights must be non-negative integers (got ${w})`);
          }
        });
        break;
    }
  });
}

/**
 * Score of one factor at an assignment of the whole model (points; -Infinity
 * when the factor forbids it).
 */
export function factorScore(model: Model, f: Factor, x: Assignment): number {
  const vars = model.variables;
  switch (f.kind) {
    case 'unary':
      return f.table[x[f.v]!]!;
    case 'pairwise':
      return f.table[x[f.a]! * vars[f.b]!.cardinality + x[f.b]!]!;
    case 'table': {
      let idx = 0;
      for (const v of f.vars) idx = idx * vars[v]!.cardinality + x[v]!;
      return f.table[idx]!;
    }
    case 'sameKey': {
      const ka = keyOf(vars[f.a]!, x[f.a]!);
      return ka >= 0 && ka === keyOf(vars[f.b]!, x[f.b]!) ? f.weight : 0;
    }
    case 'sparsePair': {
      const ka = keyOf(vars[f.a]!, x[f.a]!);
      const kb = keyOf(vars[f.b]!, x[f.b]!);
      for (const [ea, eb, s] of f.entries) if (ea === ka && eb === kb) return s;
      return f.default;
    }
    case 'allDifferent': {
      const penalty = f.penalty ?? -Infinity;
      const count = new Map<number, number>();
      let total = 0;
      for (const v of f.vars) {
        const k = keyOf(vars[v]!, x[v]!);
        if (k < 0) continue;
        const c = count.get(k) ?? 0;
        // each earlier holder of the key makes one colliding pair
        if (c > 0) total += c * penalty;
        count.set(k, c + 1);
      }
      return total;
    }
    case 'counting': {
      let s = 0;
      f.vars.forEach((v, j) => {
        const xv = x[v]!;
        for (const [val, w] of f.weights[j]!) if (val === xv) s += w;
      });
      return countingScoreAt(f, s);
    }
  }
}

/** Best and worst finite... plus whether -Infinity occurs; used for big-M and concessions. */
export function isHardFactor(f: Factor): boolean {
  if (f.hard !== undefined) return f.hard;
  switch (f.kind) {
    case 'allDifferent':
      return (f.penalty ?? -Infinity) === -Infinity;
    case 'sameKey':
      return f.weight === -Infinity;
    default:
      return false;
  }
}

/** Variable → indices of the factors that touch it. */
export function factorsByVariable(model: Model): number[][] {
  const out: number[][] = model.variables.map(() => []);
  model.factors.forEach((f, fi) => {
    for (const v of scopeOf(f)) out[v]!.push(fi);
  });
  return out;
}

/** Display label of value x of variable v. */
export function valueLabel(v: Variable, x: number): string {
  return v.labels?.[x] ?? String(x);
}
