/**
 * The message state shared by the message-passing algorithms (MPLP, max-product, sum-product):
 * one flat message array per operator, the variable beliefs b_i = θ_i + Σ_c m_{c→i}, the
 * buffers one operator update works in, and the product update both product algorithms use.
 */
import { NEG, lseRange } from './factor-operators';
import type { Op } from './factor-operators';
import type { Engine } from './engine';

/** Message state: one flat message array per operator and the variable beliefs b_i = θ_i + Σ messages. */
export interface MessageState {
  msg: Float64Array[];
  belief: Float64Array[];
  /** Per operator constant kept out of compact messages (dual bound bookkeeping). */
  opConst: Float64Array;
  /** Cached best states of each belief, so compact slots find their rest maximum in O(1). */
  tops: BeliefTops;
}

export function newMessageState(engine: Engine): MessageState {
  // one backing buffer for all messages: views are cheap, separate buffers are not
  let total = 0;
  for (const op of engine.ops) total += op.off[op.vars.length]!;
  const all = new Float64Array(total);
  let at = 0;
  const msg = engine.ops.map((op) => {
    const len = op.off[op.vars.length]!;
    const v = all.subarray(at, at + len);
    at += len;
    return v;
  });
  const belief = engine.theta.map((t) => Float64Array.from(t));
  return { msg, belief, opConst: new Float64Array(engine.ops.length), tops: new BeliefTops(belief) };
}

const TOP = 4;

/**
 * The TOP best states of each belief, kept under point updates (compact operators
 * change one or two states at a time); invalidated by dense updates and decreases
 * of a listed state, then rebuilt lazily by one scan.
 */
export class BeliefTops {
  idx: Int32Array;
  val: Float64Array;
  len: Uint8Array;
  valid: Uint8Array;
  constructor(private belief: Float64Array[]) {
    const n = belief.length;
    this.idx = new Int32Array(n * TOP);
    this.val = new Float64Array(n * TOP);
    this.len = new Uint8Array(n);
    this.valid = new Uint8Array(n);
  }
  private rebuild(i: number): void {
    const b = this.belief[i]!, o = i * TOP;
    let len = 0;
    for (let x = 0; x < b.length; x++) {
      const v = b[x]!;
      if (len === TOP && v <= this.val[o + TOP - 1]!) continue;
      this.settle(o, len < TOP ? len++ : TOP - 1, v, x);
    }
    this.len[i] = len;
    this.valid[i] = 1;
  }
  /** Belief of state x of variable i changed to v. */
  point(i: number, x: number, v: number): void {
    if (!this.valid[i]) return;
    const o = i * TOP, len = this.len[i]!;
    let p = -1;
    for (let k = 0; k < len; k++) if (this.idx[o + k] === x) p = k;
    if (p >= 0) {
      if (v < this.val[o + p]! && p < len - 1 && v < this.val[o + p + 1]!) {
        this.valid[i] = 0;
        return;
      }
      if (v < this.val[o + p]! && p === len - 1 && len === TOP) {
        this.valid[i] = 0;
        return;
      }
      this.settle(o, p, v, x);
      return;
    }
    if (len < TOP) {
      // fewer states than TOP are all listed already
      this.valid[i] = 0;
      return;
    }
    if (v <= this.val[o + TOP - 1]!) return;
    this.settle(o, TOP - 1, v, x);
  }
  /** Puts (x, v) at slot p of the list at o and moves it up past smaller values (insertion sort's step). */
  private settle(o: number, p: number, v: number, x: number): void {
    while (p > 0 && this.val[o + p - 1]! < v) {
      this.val[o + p] = this.val[o + p - 1]!;
      this.idx[o + p] = this.idx[o + p - 1]!;
      p--;
    }
    this.val[o + p] = v;
    this.idx[o + p] = x;
  }
  dirty(i: number): void {
    this.valid[i] = 0;
  }
  /** max of belief i over states not in the sorted list sup[from..to). */
  restMax(i: number, sup: Int32Array, from: number, to: number): number {
    if (!this.valid[i]) this.rebuild(i);
    const o = i * TOP, len = this.len[i]!;
    for (let k = 0; k < len; k++) {
      const x = this.idx[o + k]!;
      let inSup = false;
      for (let q = from; q < to; q++) if (sup[q] === x) inSup = true;
      if (!inSup) return this.val[o + k]!;
    }
    return restReduce(this.belief[i]!, sup, from, to, false);
  }
}

/** Reusable buffers for one operator update. */
export class OperatorBuffers {
  inc = new Float64Array(64);
  out = new Float64Array(64);
  incRest = new Float64Array(8);
  outRest = new Float64Array(8);
  prepare(op: Op): void {
    const n = op.vars.length, len = op.off[n]!;
    if (this.inc.length < len) {
      this.inc = new Float64Array(len * 2);
      this.out = new Float64Array(len * 2);
    }
    if (this.incRest.length < n) {
      this.incRest = new Float64Array(n * 2);
      this.outRest = new Float64Array(n * 2);
    }
  }
}

/**
 * Fill buffers with incoming messages inc = b_i - m_{c→i} (in the operator's layout);
 * incRest = max (or log-sum-exp) of b_i over states outside a compact support.
 */
export function gatherIncoming(engine: Engine, state: MessageState, oi: number, buf: OperatorBuffers, sum: boolean): void {
  const op = engine.ops[oi]!;
  buf.prepare(op);
  const m = state.msg[oi]!, inc = buf.inc, off = op.off, sup = op.sup;
  for (let s = 0; s < op.vars.length; s++) {
    const b = state.belief[op.vars[s]!]!;
    const o = off[s]!;
    if (!sup) {
      for (let x = 0; x < b.length; x++) inc[o + x] = b[x]! - m[o + x]!;
      continue;
    }
    const e = off[s + 1]!;
    for (let k = o; k < e; k++) inc[k] = b[sup[k]!]! - m[k]!;
    buf.incRest[s] = op.restCount![s]! > 0 ? (sum ? restReduce(b, sup, o, e, true) : state.tops.restMax(op.vars[s]!, sup, o, e)) : NEG;
  }
}

/** max or log-sum-exp of v over indices not in the sorted list sup[from..to). */
export function restReduce(v: Float64Array, sup: Int32Array, from: number, to: number, sum: boolean): number {
  let m = NEG, k = from;
  for (let x = 0; x < v.length; x++) {
    if (k < to && sup[k] === x) {
      k++;
      continue;
    }
    if (v[x]! > m) m = v[x]!;
  }
  if (!sum || m === NEG) return m;
  k = from;
  let s = 0;
  for (let x = 0; x < v.length; x++) {
    if (k < to && sup[k] === x) {
      k++;
      continue;
    }
    s += Math.exp(v[x]! - m);
  }
  return m + Math.log(s);
}

/** Replace slot s of operator oi's message by nm[off[s]..off[s+1]) and update the variable's belief. */
export function setSlot(engine: Engine, state: MessageState, oi: number, s: number, nm: Float64Array): void {
  const op = engine.ops[oi]!;
  const i = op.vars[s]!, m = state.msg[oi]!, b = state.belief[i]!;
  const o = op.off[s]!, e = op.off[s + 1]!, sup = op.sup;
  if (!sup) {
    for (let k = o; k < e; k++) {
      b[k - o]! += nm[k]! - m[k]!;
      m[k] = nm[k]!;
    }
    state.tops.dirty(i);
  } else
    for (let k = o; k < e; k++) {
      const x = sup[k]!;
      b[x]! += nm[k]! - m[k]!;
      m[k] = nm[k]!;
      state.tops.point(i, x, b[x]!);
    }
}

/** The dual's variable part: the engine's constant plus Σ_i max_x b_i(x) (both bounds start from it). */
export function beliefMaxSum(engine: Engine, state: MessageState): number {
  let u = engine.constant;
  for (const b of state.belief) {
    let m = NEG;
    for (let x = 0; x < b.length; x++) if (b[x]! > m) m = b[x]!;
    u += m;
  }
  return u;
}

/** Argmax of each belief (lowest index on ties). */
export function decodeBeliefs(state: MessageState): Int32Array {
  return Int32Array.from(state.belief, (b) => {
    let bi = 0;
    for (let x = 1; x < b.length; x++) if (b[x]! > b[bi]!) bi = x;
    return bi;
  });
}

/**
 * Loopy max-product (max-sum) update of operator c, sequential schedule:
 *   m_{c→i}(x_i) ← d·m_{c→i}(x_i) + (1-d)·[ max_{x_c\i} (θ_c + Σ_{j≠i} (b_j - m_{c→j})) - norm ]
 * normalized to max 0 (dense) or rest 0 (compact). Exact after two passes on a tree.
 * Returns the largest change.
 */
export function productUpdate(engine: Engine, state: MessageState, oi: number, buf: OperatorBuffers, sum: boolean, damping: number): number {
  const op = engine.ops[oi]!;
  gatherIncoming(engine, state, oi, buf, sum);
  const out = buf.out, off = op.off, old = state.msg[oi]!;
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
    setSlot(engine, state, oi, s, out);
  }
  return change;
}
