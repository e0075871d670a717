/**
 * Sum-product marginals and the log partition function log Z = log Σ_x exp(score(x)).
 * Exact by enumeration on tiny models and by two passes on forests; on loopy
 * graphs damped sequential sum-product with the Bethe estimate of log Z, which is
 * an APPROXIMATION (labelled exact: false, method 'loopy-bethe').
 */
import type { Model } from '../model/types';
import { OpBuffers, buildEngine, isForest, log10States, newMessageState } from './engine';
import { beliefsToMarginals, enumerateModel, exactTreeMarginals } from './exact';
import { betheLogZ, productUpdate } from './message-passing';
import { DEFAULT_MARGINAL_OPTIONS, type MarginalOptions } from './options';

export interface MarginalResult {
  /** marginals[i][x] = P(x_i = x) for p(x) ∝ exp(score(x)). */
  marginals: Float64Array[];
  logZ: number;
  method: 'enumerate' | 'tree' | 'loopy-bethe';
  /** True for enumeration and trees; false for the loopy approximation. */
  exact: boolean;
  converged: boolean;
  iterations: number;
}

export function computeMarginals(model: Model, options?: Partial<MarginalOptions>): MarginalResult {
  const opt = { ...DEFAULT_MARGINAL_OPTIONS, ...options };
  // sum-product works with real -Infinity semantics through a huge penalty: e^{-H} underflows to 0
  const E = buildEngine(model);
  if (log10States(E) <= Math.log10(opt.enumerationLimit)) {
    const r = enumerateModel(model, opt.enumerationLimit);
    return { marginals: r.marginals, logZ: r.logZ, method: 'enumerate', exact: true, converged: true, iterations: 1 };
  }
  if (isForest(E)) {
    const r = exactTreeMarginals(E);
    return { marginals: r.marginals, logZ: fixInfeasible(r.logZ, E.H), method: 'tree', exact: true, converged: true, iterations: 2 };
  }
  const st = newMessageState(E);
  const buf = new OpBuffers();
  const t0 = Date.now();
  const order = Array.from(E.ops.keys());
  let converged = false, it = 0;
  for (it = 1; it <= opt.maxIterations; it++) {
    let change = 0;
    const seq = it % 2 ? order : [...order].reverse();
    for (const oi of seq) change = Math.max(change, productUpdate(E, st, oi, buf, true, opt.damping));
    if (change < opt.tolerance) {
      converged = true;
      break;
    }
    if (Date.now() - t0 > opt.timeLimitMs) break;
  }
  return { marginals: beliefsToMarginals(st.belief), logZ: fixInfeasible(betheLogZ(E, st, buf), E.H), method: 'loopy-bethe', exact: false, converged, iterations: it };
}

/** A log Z dominated by big-M penalties means no feasible assignment carries mass. */
function fixInfeasible(logZ: number, H: number): number {
  return logZ < -H / 2 ? -Infinity : logZ;
}
