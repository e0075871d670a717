/**
 * Sum-product marginals and the log partition function log Z = log Σ_x exp(score(x)).
 * Exact by enumeration on tiny models and by two passes on forests; on loopy
 * graphs damped sequential sum-product with the Bethe estimate of log Z, which is
 * an APPROXIMATION (labelled exact: false, method 'loopy-bethe').
 */
import type { Model } from '../model/types';
import { buildEngine, isForest, log10States } from './engine';
import { beliefsToMarginals, enumerateModel, exactTreeMarginals } from './exact';
import { loopySumProduct } from './sum-product';
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
  const engine = buildEngine(model);
  if (log10States(engine) <= Math.log10(opt.enumerationLimit)) {
    const r = enumerateModel(model, opt.enumerationLimit);
    return { marginals: r.marginals, logZ: r.logZ, method: 'enumerate', exact: true, converged: true, iterations: 1 };
  }
  if (isForest(engine)) {
    const r = exactTreeMarginals(engine);
    return { marginals: r.marginals, logZ: fixInfeasible(r.logZ, engine.H), method: 'tree', exact: true, converged: true, iterations: 2 };
  }
  const r = loopySumProduct(engine, opt);
  return { marginals: beliefsToMarginals(r.state.belief), logZ: fixInfeasible(r.logZ, engine.H), method: 'loopy-bethe', exact: false, converged: r.converged, iterations: r.iterations };
}

/** A log Z dominated by big-M penalties means no feasible assignment carries mass. */
function fixInfeasible(logZ: number, H: number): number {
  return logZ < -H / 2 ? -Infinity : logZ;
}
