/**
 * Independent reference optimum by integer linear programming with
 * javascript-lp-solver (npm), for benchmarks and tests. Formulation: binary
 * indicators u_i(v) with Σ_v u_i(v) = 1, continuous factor marginals μ_c(x_c) ≥ 0
 * over the allowed entries of each factor's dense table, and marginalization
 * constraints Σ_{x_c: x_i = v} μ_c(x_c) = u_i(v); maximize Σ θ_i u_i + Σ θ_c μ_c.
 * With u integral this is exactly the MAP problem. Dev-only (imports a devDependency).
 */
import solver from 'javascript-lp-solver';
import type { Model } from '../model/types';
import { factorScore, scopeOf } from '../model/factor-graph';

export interface IlpResult {
  feasible: boolean;
  score: number;
  assignment: number[];
}

export function ilpOptimum(model: Model, timeoutMs = 60_000): IlpResult {
  const vars = model.variables;
  const variables: Record<string, Record<string, number>> = {};
  const constraints: Record<string, { equal: number }> = {};
  const binaries: Record<string, 1> = {};
  const unaryScore = vars.map((v) => new Array<number>(v.cardinality).fill(0));
  const forbidden = vars.map((v) => new Array<boolean>(v.cardinality).fill(false));
  let constant = model.constant ?? 0;
  const x = new Array<number>(vars.length).fill(0);
  model.factors.forEach((f, c) => {
    const scope = scopeOf(f);
    if (scope.length === 0) {
      constant += factorScore(model, f, x);
      return;
    }
    if (scope.length === 1) {
      const i = scope[0]!;
      for (let v = 0; v < vars[i]!.cardinality; v++) {
        x[i] = v;
        const s = factorScore(model, f, x);
        if (s === -Infinity) forbidden[i]![v] = true;
        else unaryScore[i]![v]! += s;
      }
      return;
    }
    const cards = scope.map((i) => vars[i]!.cardinality);
    const size = cards.reduce((a, b) => a * b, 1);
    const idx = new Array<number>(scope.length).fill(0);
    for (let s = 0; s < scope.length; s++) for (let v = 0; v < cards[s]!; v++) constraints[`m${c}_${s}_${v}`] = { equal: 0 };
    for (let e = 0; e < size; e++) {
      scope.forEach((i, j) => (x[i] = idx[j]!));
      const sc = factorScore(model, f, x);
      if (sc !== -Infinity) {
        const col: Record<string, number> = { obj: sc };
        scope.forEach((_, s) => (col[`m${c}_${s}_${idx[s]}`] = 1));
        variables[`f${c}_${e}`] = col;
      }
      for (let j = scope.length - 1; j >= 0; j--) {
        if (++idx[j]! < cards[j]!) break;
        idx[j] = 0;
      }
    }
  });
  // unary indicators, linked to every factor marginal of the variable
  const slotsOf: Array<Array<[number, number]>> = vars.map(() => []);
  model.factors.forEach((f, c) => {
    const scope = scopeOf(f);
    if (scope.length >= 2) scope.forEach((i, s) => slotsOf[i]!.push([c, s]));
  });
  vars.forEach((v, i) => {
    constraints[`one${i}`] = { equal: 1 };
    for (let val = 0; val < v.cardinality; val++) {
      const name = `u${i}_${val}`;
      const col: Record<string, number> = { obj: unaryScore[i]![val]!, [`one${i}`]: 1 };
      for (const [c, s] of slotsOf[i]!) col[`m${c}_${s}_${val}`] = -1;
      if (forbidden[i]![val]) col[`one${i}`] = 0, (constraints[`ban${i}_${val}`] = { equal: 0 }), (col[`ban${i}_${val}`] = 1);
      variables[name] = col;
      binaries[name] = 1;
    }
  });
  const res = solver.Solve({ optimize: 'obj', opType: 'max', constraints, variables, binaries, options: { timeout: timeoutMs, tolerance: 0 } }) as unknown as Record<string, number> & { feasible: boolean; result: number };
  if (!res.feasible) return { feasible: false, score: -Infinity, assignment: [] };
  const assignment = vars.map((v, i) => {
    let best = 0, bv = -Infinity;
    for (let val = 0; val < v.cardinality; val++) {
      const u = res[`u${i}_${val}`] ?? 0;
      if (u > bv) (bv = u), (best = val);
    }
    return best;
  });
  return { feasible: true, score: res.result + constant, assignment };
}
