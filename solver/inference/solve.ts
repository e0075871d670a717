/**
 * The MAP entry point: anytime, seeded, cancellable. It picks an algorithm and runs it on one
 * compiled engine.
 *
 * method 'auto':
 *   1. tiny state space → exhaustive enumeration (exact; exact.ts);
 *   2. forest-shaped factor graph → two-pass max-product with clamped decoding (exact; exact.ts);
 *   3. otherwise MPLP (mplp.ts): dual sweeps giving the upper bound, decoding with local search,
 *      and once the dual stalls the primal search and, on small models, branch and bound.
 * method 'maxProduct' runs damped loopy max-product (max-product.ts) instead of MPLP.
 *
 * Result scores are exact model scores (-Infinity when no feasible assignment was
 * found). gap = (bound - score) / max(1, |score|).
 */
import type { Model } from '../model/types';
import { AnytimeRun, anytimeSolver, type RunSteps } from './anytime';
import { isForest, log10States, type Engine } from './engine';
import { enumerationSteps, treeSteps } from './exact';
import type { MapResult, MapSolver } from './map-solver';
import { maxProductSteps } from './max-product';
import { mplpSteps } from './mplp';
import { DEFAULT_MAP_OPTIONS, type MapOptions } from './options';

export type { HistoryPoint, MapResult, StopReason } from './map-solver';
export { relativeGap } from './map-solver';
export { tick } from './anytime';

function* autoSteps(run: AnytimeRun, opt: MapOptions, signal: AbortSignal | undefined): RunSteps {
  const engine = run.engine, method = opt.method;
  if (signal?.aborted) {
    run.finish('none', 'aborted', false);
    return;
  }
  if (engine.n === 0) {
    run.bestX = new Int32Array(0);
    run.bound = engine.constant;
    run.finish('enumerate', 'optimal', true);
    return;
  }
  const tiny = log10States(engine) <= Math.log10(Math.max(1, opt.enumerationLimit));
  if (method === 'enumerate' || (method === 'auto' && tiny)) {
    enumerationSteps(run, method === 'enumerate' ? Number.MAX_SAFE_INTEGER : opt.enumerationLimit);
    return;
  }
  if (method === 'tree' || (method === 'auto' && isForest(engine))) {
    treeSteps(run);
    return;
  }
  if (method === 'maxProduct') yield* maxProductSteps(run, opt, signal);
  else yield* mplpSteps(run, opt, signal);
}

/** The 'auto' dispatcher (and every `method`) behind one MapSolver. */
export const autoSolver: MapSolver<MapOptions> = anytimeSolver('auto', DEFAULT_MAP_OPTIONS, autoSteps);

/**
 * Solve for the MAP assignment synchronously. The signal is checked between
 * sweeps (it can be aborted from onProgress or another thread).
 */
export function solveMapSync(model: Model, options?: Partial<MapOptions>, signal?: AbortSignal): MapResult {
  return autoSolver.solveSync!(model, options, signal);
}

/**
 * Solve for the MAP assignment, yielding to the event loop between sweeps so an
 * AbortSignal from elsewhere in the process can stop it. Resolves (never rejects
 * on abort) with the best assignment so far.
 */
export function solveMap(model: Model, options?: Partial<MapOptions>, signal?: AbortSignal): Promise<MapResult> {
  return autoSolver.solve(model, options, signal);
}

export type { Engine };
