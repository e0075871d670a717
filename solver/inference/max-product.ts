/**
 * Damped loopy max-product (max-sum), sequential schedule. Its bound is the dual value of its
 * messages read as a reparametrisation (valid, usually looser than MPLP's). Exact after two
 * passes on a forest (exact.ts runs those).
 */
import { AnytimeRun, anytimeSolver, type RunSteps } from './anytime';
import type { Engine } from './engine';
import { NEG } from './factor-operators';
import { finishLoopy, primalSearch, searchLeft, startLoopy, sweeps } from './loopy';
import type { MapSolver } from './map-solver';
import { OperatorBuffers, beliefMaxSum, productUpdate, type MessageState } from './message-state';
import { DEFAULT_MAX_PRODUCT_OPTIONS, type MaxProductOptions } from './options';

/**
 * One max-product update of operator c:
 *   m_{c→i}(x_i) ← d·m_{c→i}(x_i) + (1-d)·[ max_{x_c\i} (θ_c + Σ_{j≠i} (b_j - m_{c→j})) - norm ],
 * normalised to max 0 (dense) or rest 0 (compact). Returns the largest change.
 */
export function maxProductUpdate(engine: Engine, state: MessageState, oi: number, buf: OperatorBuffers, damping: number): number {
  return productUpdate(engine, state, oi, buf, false, damping);
}

/**
 * Dual bound for ANY message state, treating messages as a reparametrization:
 * U = Σ_i max b_i + Σ_c max_{x_c} [θ_c - Σ_i m_{c→i}]. Used for loopy max-product runs.
 */
export function reparametrizationBound(engine: Engine, state: MessageState, buf: OperatorBuffers): number {
  let u = beliefMaxSum(engine, state);
  for (let oi = 0; oi < engine.ops.length; oi++) {
    const op = engine.ops[oi]!;
    buf.prepare(op);
    const m = state.msg[oi]!, n = op.vars.length, len = op.off[n]!;
    for (let k = 0; k < len; k++) buf.inc[k] = -m[k]!;
    for (let s = 0; s < n; s++) buf.incRest[s] = op.sup && op.restCount![s]! > 0 ? 0 : NEG;
    op.message('max', buf.inc, buf.incRest, buf.out, buf.outRest);
    let best = NEG;
    for (let k = 0; k < op.off[1]!; k++) if (buf.out[k]! + buf.inc[k]! > best) best = buf.out[k]! + buf.inc[k]!;
    if (op.sup && op.restCount![0]! > 0 && buf.outRest[0]! > best) best = buf.outRest[0]!;
    u += best;
  }
  return u;
}

/** The max-product run on a compiled engine. */
export function* maxProductSteps(run: AnytimeRun, opt: MaxProductOptions, signal: AbortSignal | undefined): RunSteps {
  const engine = run.engine;
  const loopy = startLoopy(run, opt);
  const state = loopy.state, buf = new OperatorBuffers();
  yield;
  let stopReason = yield* sweeps(
    loopy,
    {
      update: (oi) => void maxProductUpdate(engine, state, oi, buf, opt.damping),
      bound: (iteration) => (iteration % opt.decodeEvery === 0 ? reparametrizationBound(engine, state, buf) : Infinity),
      stopAtStall: false,
    },
    opt,
    signal,
  );
  if (stopReason === 'stalled' && searchLeft(loopy, signal)) stopReason = yield* primalSearch(loopy, signal);
  finishLoopy(loopy, 'maxProduct', stopReason);
}

export const maxProductSolver: MapSolver<MaxProductOptions> = anytimeSolver('maxProduct', DEFAULT_MAX_PRODUCT_OPTIONS, maxProductSteps);
