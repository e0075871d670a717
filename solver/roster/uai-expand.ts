/**
 * Counting factors → small dense factors, so a compiled roster can be written as a UAI
 * MARKOV file (which has only dense tables) and checked by an independent solver. A counting
 * factor over n seats would be one table of Π K_i entries (10^60 for a week's window); here
 * it becomes a chain of partial sums instead:
 *
 *   y_j = w_j(x_j)                          (one variable per seat and weight pattern, shared)
 *   S_1 = min(y_1, C−1),  S_j = min(S_{j−1} + y_j, C−1)   (hard ternary tables)
 *   score(S_n)                              (a unary table)
 *
 * where C is the factor's table length: sums past it score like its last entry, so saturating
 * there is exact. Every auxiliary variable is determined by the seats, so for any seat
 * assignment the expanded model's best completion scores exactly what the original does.
 * The seat variables keep their indices 0..n−1; auxiliaries follow.
 */
import type { CountingFactor, Factor, Model, Variable } from '../model/types';
import { countingMaxSum, countingScoreAt } from '../model/factor-graph';

export type ExpandedModel = {
  model: Model;
  /** Number of original variables (the seats): an MPE answer's first values. */
  originalVariables: number;
  /** Complete a seat assignment with its auxiliary values (for checking scores). */
  complete(x: ArrayLike<number>): number[];
};

export function expandCountingForUai(model: Model): ExpandedModel {
  const variables: Variable[] = model.variables.map((v) => ({ ...v }));
  const factors: Factor[] = [];
  const n = model.variables.length;
  // how each auxiliary is computed from earlier values, in creation order
  const recipe: ({ kind: 'weight'; v: number; w: Map<number, number>; values: number[] } | { kind: 'sum'; prev: number; y: number; yValues: number[]; cap: number } | { kind: 'first'; y: number; yValues: number[]; cap: number })[] = [];
  const weightVar = new Map<string, number>();

  /** Variable y = w(x_v) over the distinct weights (0 included), shared between factors. */
  const weightOf = (v: number, ws: Array<[number, number]>): { y: number; values: number[] } => {
    const w = new Map<number, number>();
    for (const [x, wt] of ws) w.set(x, (w.get(x) ?? 0) + wt);
    const key = `${v}|${[...w.entries()].sort((a, b) => a[0] - b[0]).map(([x, wt]) => `${x}:${wt}`).join(',')}`;
    const values = [...new Set([0, ...w.values()])].sort((a, b) => a - b);
    const known = weightVar.get(key);
    if (known !== undefined) return { y: known, values };
    const y = variables.length;
    variables.push({ name: `w${y}(${model.variables[v].name})`, cardinality: values.length, labels: values.map(String) });
    const K = model.variables[v].cardinality;
    const table = new Float64Array(K * values.length).fill(-Infinity);
    for (let x = 0; x < K; x++) table[x * values.length + values.indexOf(w.get(x) ?? 0)] = 0;
    factors.push({ kind: 'pairwise', a: v, b: y, table, hard: true, id: `uai-weight:${y}` });
    recipe.push({ kind: 'weight', v, w, values });
    weightVar.set(key, y);
    return { y, values };
  };

  for (const f of model.factors) {
    if (f.kind !== 'counting') {
      factors.push(f);
      continue;
    }
    const c = f as CountingFactor;
    const length = typeof c.score === 'function' ? countingMaxSum(c) + 1 : Math.max(1, Math.min(c.score.length, countingMaxSum(c) + 1));
    const C = length;
    const final = new Float64Array(C);
    for (let s = 0; s < C; s++) final[s] = countingScoreAt(c, s);
    let prev = -1;
    c.vars.forEach((v, j) => {
      const { y, values } = weightOf(v, c.weights[j]);
      const S = variables.length;
      variables.push({ name: `sum${S}(${c.id ?? 'counting'})`, cardinality: C });
      if (prev < 0) {
        const table = new Float64Array(values.length * C).fill(-Infinity);
        values.forEach((w, yi) => (table[yi * C + Math.min(w, C - 1)] = 0));
        factors.push({ kind: 'pairwise', a: y, b: S, table, hard: true, id: `uai-sum:${S}` });
        recipe.push({ kind: 'first', y, yValues: values, cap: C });
      } else {
        // vars order (prev, y, S): S varies fastest
        const table = new Float64Array(C * values.length * C).fill(-Infinity);
        for (let a = 0; a < C; a++) values.forEach((w, yi) => (table[(a * values.length + yi) * C + Math.min(a + w, C - 1)] = 0));
        factors.push({ kind: 'table', vars: [prev, y, S], table, hard: true, id: `uai-sum:${S}` });
        recipe.push({ kind: 'sum', prev, y, yValues: values, cap: C });
      }
      prev = S;
    });
    if (prev < 0) continue; // no variables: the score is a constant the model already holds
    factors.push({ kind: 'unary', v: prev, table: final, hard: c.hard, id: c.id, label: c.label });
  }

  const complete = (x: ArrayLike<number>): number[] => {
    const out = Array.from(x).slice(0, n);
    recipe.forEach((r) => {
      if (r.kind === 'weight') out.push(r.values.indexOf(r.w.get(out[r.v]) ?? 0));
      else if (r.kind === 'first') out.push(Math.min(r.yValues[out[r.y]], r.cap - 1));
      else out.push(Math.min(out[r.prev] + r.yValues[out[r.y]], r.cap - 1));
    });
    return out;
  };
  return { model: { ...model, variables, factors }, originalVariables: n, complete };
}
