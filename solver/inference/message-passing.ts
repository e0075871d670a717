/**
 * Sequential message-passing updates over the compiled operators:
 * MPLP (dual block-coordinate descent, gives an upper bound), loopy max-product
 * with damping, and sum-product, plus the Bethe log-partition estimate.
 */
import { NEG, lse2, lseRange } from './ops';
import { OpBuffers, gatherIncoming, setSlot, type Engine, type MessageState } from './engine';

/**
 * One MPLP star update of operator c (Globerson & Jaakkola 2007, generalized to
 * factors). With λ_i = b_i - δ_{c→i} and M_i(x_i) = max_{x_c\i} [θ_c + Σ_j λ_j]:
 *
 *   δ_{c→i}(x_i) ← M_i(x_i)/|c| - λ_i(x_i)
 *
 * which minimizes the dual U(δ) = Σ_i max b_i + Σ_c max_{x_c} [θ_c - Σ_i δ_{c→i}]
 * over the block δ_{c→·}; after it the factor term is 0. Compact slots use the
 * same update on state classes (support states, one class for the rest) and keep
 * the rest-class value in opConst[c], so U = Σ_i max b_i + Σ_c opConst[c] + const.
 * Precondition: all scores finite (big-M applied by buildEngine).
 */
export function mplpUpdate(E: Engine, st: MessageState, oi: number, buf: OpBuffers): void {
  const op = E.ops[oi]!;
  gatherIncoming(E, st, oi, buf, false);
  const inc = buf.inc, out = buf.out, off = op.off;
  op.message('max', inc, buf.incRest, out, buf.outRest);
  const n = op.vars.length;
  let cst = 0;
  for (let s = 0; s < n; s++) {
    let restD = 0;
    if (op.sup && op.restCount![s]! > 0) {
      const ir = buf.incRest[s]!;
      restD = (buf.outRest[s]! + ir) / n - ir;
      cst += restD;
    }
    for (let k = off[s]!; k < off[s + 1]!; k++) out[k] = (out[k]! + inc[k]!) / n - inc[k]! - restD;
    setSlot(E, st, oi, s, out);
  }
  st.opConst[oi] = cst;
}

/** Dual bound U(δ) of an MPLP state (valid once every operator has been updated). */
export function mplpBound(E: Engine, st: MessageState): number {
  let u = E.constant;
  for (const b of st.belief) {
    let m = NEG;
    for (let x = 0; x < b.length; x++) if (b[x]! > m) m = b[x]!;
    u += m;
  }
  for (let c = 0; c < st.opConst.length; c++) u += st.opConst[c]!;
  return u;
}

/**
 * Dual bound for ANY message state, treating messages as a reparametrization:
 * U = Σ_i max b_i + Σ_c max_{x_c} [θ_c - Σ_i m_{c→i}]. Used for loopy max-product runs.
 */
export function generalDualBound(E: Engine, st: MessageState, buf: OpBuffers): number {
  let u = E.constant;
  for (const b of st.belief) {
    let m = NEG;
    for (let x = 0; x < b.length; x++) if (b[x]! > m) m = b[x]!;
    u += m;
  }
  for (let oi = 0; oi < E.ops.length; oi++) {
    const op = E.ops[oi]!;
    buf.prepare(op);
    const m = st.msg[oi]!, n = op.vars.length, len = op.off[n]!;
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

/**
 * Loopy max-product (max-sum) update of operator c, sequential schedule:
 *   m_{c→i}(x_i) ← d·m_{c→i}(x_i) + (1-d)·[ max_{x_c\i} (θ_c + Σ_{j≠i} (b_j - m_{c→j})) - norm ]
 * normalized to max 0 (dense) or rest 0 (compact). Exact after two passes on a tree.
 * Returns the largest change.
 */
export function productUpdate(E: Engine, st: MessageState, oi: number, buf: OpBuffers, sum: boolean, damping: number): number {
  const op = E.ops[oi]!;
  gatherIncoming(E, st, oi, buf, sum);
  const out = buf.out, off = op.off, old = st.msg[oi]!;
  op.message(sum ? 'sum' : 'max', buf.inc, buf.incRest, out, buf.outRest);
  let change = 0;
  for (let s = 0; s < op.vars.length; s++) {
    const o = off[s]!, e = off[s + 1]!;
    let norm: number;
    if (op.sup && op.restCount![s]! > 0) norm = buf.outRest[s]!;
    else if (sum) norm = lseRange(out, o, e);
    else {
      norm = NEG;
      for (let k = o; k < e; k++) if (out[k]! > norm) norm = out[k]!;
    }
    if (!Number.isFinite(norm)) norm = 0;
    for (let k = o; k < e; k++) {
      let v = out[k]! - norm;
      if (damping > 0) v = damping * old[k]! + (1 - damping) * v;
      const d = Math.abs(v - old[k]!);
      if (d > change) change = d;
      out[k] = v;
    }
    setSlot(E, st, oi, s, out);
  }
  return change;
}

/**
 * Bethe estimate of log Z from the current sum-product messages:
 *   log Z ≈ Σ_i (1 - d_i) log Σ_x e^{b_i(x)} + Σ_c log Σ_{x_c} e^{θ_c + Σ_i (b_i - m_{c→i})} + const.
 * Exact on forests at the fixed point.
 */
export function betheLogZ(E: Engine, st: MessageState, buf: OpBuffers): number {
  let z = E.constant;
  for (let i = 0; i < E.n; i++) z += (1 - E.adjOp[i]!.length) * lseRange(st.belief[i]!);
  for (let oi = 0; oi < E.ops.length; oi++) {
    const op = E.ops[oi]!;
    gatherIncoming(E, st, oi, buf, true);
    op.message('sum', buf.inc, buf.incRest, buf.out, buf.outRest);
    let acc = NEG;
    for (let k = 0; k < op.off[1]!; k++) acc = lse2(acc, buf.inc[k]! + buf.out[k]!);
    if (op.sup && op.restCount![0]! > 0) acc = lse2(acc, buf.incRest[0]! + buf.outRest[0]!);
    z += acc;
  }
  return z;
}

/** Operator order for a forest: breadth-first from each component's first variable (downward order). */
export function forestOrder(E: Engine): { order: number[]; parentVar: Int32Array; roots: number[] } {
  const seenVar = new Uint8Array(E.n), seenOp = new Uint8Array(E.ops.length);
  const parentVar = new Int32Array(E.ops.length).fill(-1);
  const order: number[] = [];
  const roots: number[] = [];
  for (let r = 0; r < E.n; r++) {
    if (seenVar[r]) continue;
    roots.push(r);
    seenVar[r] = 1;
    const queue = [r];
    for (let q = 0; q < queue.length; q++) {
      const v = queue[q]!;
      for (const oi of E.adjOp[v]!) {
        if (seenOp[oi]) continue;
        seenOp[oi] = 1;
        parentVar[oi] = v;
        order.push(oi);
        for (const u of E.ops[oi]!.vars) {
          if (!seenVar[u]) {
            seenVar[u] = 1;
            queue.push(u);
          }
        }
      }
    }
  }
  return { order, parentVar, roots };
}
