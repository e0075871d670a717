/**
 * Sum-product (log-sum-exp messages): the update, the Bethe estimate of log Z, and the damped
 * loopy run behind computeMarginals on graphs with cycles (an approximation; marginals.ts
 * labels it so). Exact after two passes on a forest (exact.ts).
 */
import { NEG, lse2, lseRange } from './factor-operators';
import type { Engine } from './engine';
import { OperatorBuffers, gatherIncoming, newMessageState, productUpdate, type MessageState } from './message-state';
import type { MarginalOptions } from './options';

/**
 * One sum-product update of operator c:
 *   m_{c→i}(x_i) ← d·m_{c→i}(x_i) + (1-d)·[ log Σ_{x_c\i} exp(θ_c + Σ_{j≠i} (b_j - m_{c→j})) - norm ],
 * normalised to log-sum 0 (dense) or rest 0 (compact). Returns the largest change.
 */
export function sumProductUpdate(engine: Engine, state: MessageState, oi: number, buf: OperatorBuffers, damping: number): number {
  return productUpdate(engine, state, oi, buf, true, damping);
}

/**
 * Bethe estimate of log Z from the current sum-product messages:
 *   log Z ≈ Σ_i (1 - d_i) log Σ_x e^{b_i(x)} + Σ_c log Σ_{x_c} e^{θ_c + Σ_i (b_i - m_{c→i})} + const.
 * Exact on forests at the fixed point.
 */
export function betheLogZ(engine: Engine, state: MessageState, buf: OperatorBuffers): number {
  let z = engine.constant;
  for (let i = 0; i < engine.n; i++) z += (1 - engine.adjOp[i]!.length) * lseRange(state.belief[i]!);
  for (let oi = 0; oi < engine.ops.length; oi++) {
    const op = engine.ops[oi]!;
    gatherIncoming(engine, state, oi, buf, true);
    op.message('sum', buf.inc, buf.incRest, buf.out, buf.outRest);
    let acc = NEG;
    for (let k = 0; k < op.off[1]!; k++) acc = lse2(acc, buf.inc[k]! + buf.out[k]!);
    if (op.sup && op.restCount![0]! > 0) acc = lse2(acc, buf.incRest[0]! + buf.outRest[0]!);
    z += acc;
  }
  return z;
}

/** Damped sequential sum-product (forward and backward in turn) until no message moves by more than the tolerance or the budget ends. */
export function loopySumProduct(engine: Engine, opt: MarginalOptions): { state: MessageState; logZ: number; converged: boolean; iterations: number } {
  const state = newMessageState(engine);
  const buf = new OperatorBuffers();
  const t0 = Date.now();
  const order = Array.from(engine.ops.keys());
  let converged = false, it = 0;
  for (it = 1; it <= opt.maxIterations; it++) {
    let change = 0;
    const seq = it % 2 ? order : [...order].reverse();
    for (const oi of seq) change = Math.max(change, sumProductUpdate(engine, state, oi, buf, opt.damping));
    if (change < opt.tolerance) {
      converged = true;
      break;
    }
    if (Date.now() - t0 > opt.timeLimitMs) break;
  }
  return { state, logZ: betheLogZ(engine, state, buf), converged, iterations: it };
}
