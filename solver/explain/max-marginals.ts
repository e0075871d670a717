import type { Factor, Model } from '../model/types';
import { score } from '../model/score';
import { isForest, log10States, type Engine } from '../inference/engine';
import { LocalSearch, rng } from '../inference/local-search';
import { solveMap, solveMapSync, tick } from '../inference/solve';
import { MAP_PRESETS } from '../inference/options';

/**
 * Max-marginals of one variable, with the assignment each figure comes from (so a caller can
 * decode it, e.g. the server's seat alternatives score each roster with the independent scorer).
 * Two regimes:
 *
 * - exact, when the model is tiny (≤ 10^5.3 joint states: enumeration) or a forest (two-pass
 *   tree max-product): every value is forced by a hard unary factor and the model solved exactly;
 * - otherwise each value is forced and the run's roster repaired around it by local search with
 *   the variable fixed (an achievable score: a lower bound on the max-marginal), and the dual
 *   bound of a max-product/MPLP state gives an upper bound bound − max b_i + b_i(v).
 */
export interface ForcedValue {
  value: number;
  /** Best model score found with the variable at this value; -Infinity when none keeps the hard rules (proven when exact). */
  score: number;
  /** Upper bound on the best score with the variable at this value (= score when exact); Infinity when unknown. */
  bound: number;
  how: 'exact' | 'repair';
  /** False when the time ran out before this value was tried (score -Infinity, no assignment; the bound still holds). */
  evaluated: boolean;
  /** The roster behind `score` (model values), also when it breaks a hard rule (to say which). */
  assignment: Int32Array | null;
}

/** The same test solver/explain and solveMap use to choose enumeration or the tree pass. */
export const exactlySolvable = (engine: Engine): boolean => log10States(engine) <= 5.3 || isForest(engine);

/**
 * A short MPLP pass from the run's roster, for the bounds. Branch and bound stays off: it can
 * certify the optimum and report that as the bound, and bound − max b_i + b_i(v) is only an
 * upper bound with the dual bound of the state the beliefs come from (with branch and bound on,
 * 2 of 1,050 bounds fell below the enumerated max-marginal on 25 random 7 × 7 models, measured).
 */
export async function dualPass(model: Model, initial: Int32Array, timeLimitMs: number): Promise<{ bound: number; beliefs: Float64Array[] | null | undefined }> {
  const r = await solveMap(model, { ...MAP_PRESETS.seatBounds, timeLimitMs, initial });
  return { bound: r.bound, beliefs: r.beliefs };
}


function forceValue(model: Model, i: number, x: number): Factor {
  const table = Array.from({ length: model.variables[i]!.cardinality }, (_, v) => (v === x ? 0 : -Infinity));
  return { kind: 'unary', v: i, table, hard: true, id: `force:${i}`, label: 'forced alternative' };
}

export async function forcedValues(
  model: Model,
  engine: Engine,
  base: Int32Array,
  i: number,
  dual: { bound: number; beliefs: Float64Array[] | null | undefined } | null,
  options: { budgetMs: number; seed: number; /** Stop repairing at this time (Date.now()); values not reached are listed unevaluated. */ deadline?: number },
): Promise<ForcedValue[]> {
  const cur = base[i]!;
  const values = Array.from({ length: model.variables[i]!.cardinality }, (_, x) => x).filter((x) => x !== cur);
  const out: ForcedValue[] = [];
  if (exactlySolvable(engine)) {
    for (const x of values) {
      const r = solveMapSync({ ...model, factors: [...model.factors, forceValue(model, i, x)] }, { ...MAP_PRESETS.forcedChoice, seed: options.seed });
      const assignment = Int32Array.from(r.assignment);
      // optimal and infeasible means no roster with x keeps every hard rule
      out.push({ value: x, score: r.score, bound: r.optimal ? r.score : Infinity, how: r.optimal ? 'exact' : 'repair', evaluated: true, assignment });
      await tick();
    }
    return out;
  }
  const b = dual?.beliefs?.[i];
  const bmax = b ? Math.max(...b) : 0;
  const upper = (x: number): number => {
    if (!b || !dual || !Number.isFinite(dual.bound)) return Infinity;
    const u = dual.bound - bmax + b[x]!;
    // a big-M value: every roster with x breaks a hard factor of the relaxation as well
    return u < -engine.H / 2 ? -Infinity : u;
  };
  const repairMs = Math.max(8, Math.min(60, Math.floor(options.budgetMs / Math.max(1, values.length))));
  const fixed = new Uint8Array(engine.n);
  fixed[i] = 1;
  // Most promising first by the bound, so a deadline cuts the least promising; one local-search
  // pass over a large roster takes over 100 ms (60 people × 13 weeks), whatever repairMs says.
  values.sort((p, q) => upper(q) - upper(p) || p - q);
  for (const x of values) {
    if (options.deadline !== undefined && Date.now() > options.deadline) {
      out.push({ value: x, score: -Infinity, bound: upper(x), how: 'repair', evaluated: false, assignment: null });
      continue;
    }
    const start = Int32Array.from(base);
    start[i] = x;
    const ls = new LocalSearch(engine, start, rng(options.seed), fixed);
    ls.run(Date.now() + repairMs);
    const s = score(model, ls.x);
    const u = upper(x);
    // the repaired roster is achievable, so it also bounds the bound from below (rounding of the dual)
    out.push({ value: x, score: s, bound: u === -Infinity && s === -Infinity ? -Infinity : Math.max(u, s), how: 'repair', evaluated: true, assignment: Int32Array.from(ls.x) });
    await tick();
  }
  return out;
}
