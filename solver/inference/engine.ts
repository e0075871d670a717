/**
 * Compilation of a model into operators (ops.ts) plus the message state shared
 * by the message-passing algorithms.
 *
 * Hard constraints: every -Infinity is replaced by -H, H above the total range of
 * all soft scores, so that any assignment breaking a hard factor scores below every
 * feasible one. Upper bounds computed on the big-M model are valid for the original
 * model too (feasible assignments score the same; the others only gain).
 */
import { countingMaxSum, countingScoreAt, keyOf, scopeOf, validateModel } from '../model/factor-graph';
import type { Factor, Model } from '../model/types';
import { AtMostOneOp, CountingOp, NEG, PairwiseOp, PottsOp, SparseOp, TableOp, type KeyInfo, type Op, type Scratch } from './ops';

export interface Engine {
  model: Model;
  n: number;
  card: Int32Array;
  /** Summed unary scores per variable (big-M applied). */
  theta: Float64Array[];
  ops: Op[];
  /** Per variable: the operators touching it (adjOp[i][k]) and the variable's slot in each (adjSlot[i][k]). */
  adjOp: Int32Array[];
  adjSlot: Int32Array[];
  keys: KeyInfo;
  scratch: Scratch;
  H: number;
  constant: number;
  /** Number of model factors that forbid something (for reporting). */
  hasHard: boolean;
}

function finiteRange(values: Iterable<number>): number {
  let lo = Infinity, hi = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return hi >= lo ? hi - lo : 0;
}

const tableCache = new WeakMap<object, number[]>();

/** Scores of a counting factor for every reachable sum 0..max (cached per factor object). */
function countingTable(f: Factor & { kind: 'counting' }): number[] {
  const hit = tableCache.get(f);
  if (hit) return hit;
  const t = countingTableUncached(f);
  tableCache.set(f, t);
  return t;
}

function countingTableUncached(f: Factor & { kind: 'counting' }): number[] {
  if (typeof f.score !== 'function') {
    // a table repeats its last entry: no need to expand past it
    const maxS = Math.min(countingMaxSum(f), Math.max(0, f.score.length - 1));
    const t: number[] = [];
    for (let s = 0; s <= maxS; s++) t.push(countingScoreAt(f, s));
    return t;
  }
  const maxS = countingMaxSum(f);
  const t: number[] = [];
  for (let s = 0; s <= maxS; s++) t.push(countingScoreAt(f, s));
  return t;
}

/** Total soft range of the model: no two feasible assignments differ by more. */
export function softRange(model: Model): number {
  let r = 0;
  for (const f of model.factors) {
    switch (f.kind) {
      case 'unary':
      case 'pairwise':
      case 'table':
        r += finiteRange(Array.from(f.table));
        break;
      case 'sameKey':
        r += Number.isFinite(f.weight) ? Math.abs(f.weight) : 0;
        break;
      case 'allDifferent': {
        const p = f.penalty ?? NEG;
        const pairs = (f.vars.length * (f.vars.length - 1)) / 2;
        r += Number.isFinite(p) ? Math.abs(p) * pairs : 0;
        break;
      }
      case 'sparsePair':
        r += finiteRange([f.default, ...f.entries.map((e) => e[2])]);
        break;
      case 'counting':
        r += finiteRange(countingTable(f));
        break;
    }
  }
  return r;
}

export interface EngineOptions {
  hardPenalty?: number;
}

export function buildEngine(model: Model, opts: EngineOptions = {}): Engine {
  validateModel(model);
  const n = model.variables.length;
  const card = Int32Array.from(model.variables.map((v) => v.cardinality));
  const H = opts.hardPenalty && opts.hardPenalty > 0 ? opts.hardPenalty : Math.max(1000, 4 * softRange(model) + 100);
  const bm = (v: number): number => (v === NEG ? -H : v);
  let hasHard = false;
  const bmt = (t: ArrayLike<number>): Float64Array => {
    const out = new Float64Array(t.length);
    for (let i = 0; i < t.length; i++) {
      if (t[i] === NEG) hasHard = true;
      if (Number.isNaN(t[i]!) || t[i] === Infinity) throw new Error(`score ${t[i]} is not allowed (use finite points or -Infinity)`);
      out[i] = bm(t[i]!);
    }
    return out;
  };

  // dense key groups: 0 = no key; keys k >= 0 map to 1..P
  const keyMap = new Map<number, number>();
  const group: Int32Array[] = [];
  const firstOfGroup: Map<number, number>[] = [];
  const nextSame: Int32Array[] = [];
  for (const v of model.variables) {
    const g = new Int32Array(v.cardinality);
    const first = new Map<number, number>();
    const next = new Int32Array(v.cardinality).fill(-1);
    for (let x = v.cardinality - 1; x >= 0; x--) {
      const k = keyOf(v, x);
      let gi = 0;
      if (k >= 0) {
        gi = keyMap.get(k) ?? 0;
        if (!gi) {
          gi = keyMap.size + 1;
          keyMap.set(k, gi);
        }
      }
      g[x] = gi;
      const f = first.get(gi);
      if (f !== undefined) next[x] = f;
      first.set(gi, x);
    }
    group.push(g);
    firstOfGroup.push(first);
    nextSame.push(next);
  }
  const numGroups = keyMap.size + 1;
  const keys: KeyInfo = { group, firstOfGroup, nextSame, numGroups };
  const scratch: Scratch = {
    groupA: new Float64Array(numGroups),
    stamp: new Int32Array(numGroups),
    stampNow: { v: 0 },
    dp: new Float64Array(1024),
  };
  const groupOfKey = (k: number): number => (k < 0 ? 0 : keyMap.get(k) ?? -1);

  const theta = model.variables.map((v) => new Float64Array(v.cardinality));
  const ops: Op[] = [];
  const countingOp = (fi: number, vars: number[], weights: Array<Array<[number, number]>>, table: number[]): CountingOp | null => {
    // typed arrays filled in one pass: these factors can span thousands of seats
    const n = weights.length;
    let total = 0;
    for (let j = 0; j < n; j++) total += weights[j]!.length;
    const vsA = new Int32Array(n), offA = new Int32Array(n + 1), supA = new Int32Array(total), wtsA = new Int32Array(total);
    let nv = 0, ne = 0;
    for (let j = 0; j < n; j++) {
      const ws = weights[j]!;
      if (ws.length === 1) {
        // common case: one weighted value (e.g. this seat taken by the factor's person)
        const p = ws[0]!;
        if (p[1] > 0) {
          vsA[nv++] = vars[j]!;
          supA[ne] = p[0];
          wtsA[ne++] = p[1];
          offA[nv] = ne;
        }
        continue;
      }
      const m = new Map<number, number>();
      for (const [x, w] of ws) if (w > 0) m.set(x, (m.get(x) ?? 0) + w);
      if (m.size === 0) continue; // weighs 0 whatever its value: not part of the sum
      vsA[nv++] = vars[j]!;
      for (const x of [...m.keys()].sort((p, q) => p - q)) {
        supA[ne] = x;
        wtsA[ne++] = m.get(x)!;
      }
      offA[nv] = ne;
    }
    const vs = vsA.subarray(0, nv), off = offA.subarray(0, nv + 1), sup = supA.subarray(0, ne), wts = wtsA.subarray(0, ne);
    // clamp sums where the score stays constant from there on
    let S = table.length - 1;
    while (S > 0 && table[S - 1] === table[S]) S--;
    const g = bmt(table.slice(0, S + 1));
    if (nv === 0) {
      constant += g[0]!;
      return null;
    }
    const op = new CountingOp(fi, vs, off, sup, wts, card, g, scratch);
    op.H = H;
    if (g.some((_, t) => table[t] === NEG)) {
      // distance of each forbidden sum to the nearest allowed one
      const lt = Float64Array.from(g);
      const dist = new Float64Array(S + 1).fill(Infinity);
      let last = -Infinity;
      for (let t = 0; t <= S; t++) {
        if (table[t] !== NEG) last = t;
        dist[t] = t - last;
      }
      last = Infinity;
      for (let t = S; t >= 0; t--) {
        if (table[t] !== NEG) last = t;
        dist[t] = Math.min(dist[t]!, last - t);
      }
      for (let t = 0; t <= S; t++) if (table[t] === NEG) lt[t] = -H * (1 + (Number.isFinite(dist[t]!) ? dist[t]! : S + 1));
      op.localTable = lt;
      op.tailHard = table[S] === NEG;
    }
    return op;
  };
  let constant = model.constant ?? 0;

  model.factors.forEach((f, fi) => {
    switch (f.kind) {
      case 'unary': {
        const t = bmt(f.table);
        const th = theta[f.v]!;
        for (let x = 0; x < t.length; x++) th[x]! += t[x]!;
        break;
      }
      case 'pairwise':
        ops.push(new PairwiseOp(fi, f.a, f.b, card[f.a]!, card[f.b]!, bmt(f.table)));
        break;
      case 'table':
        if (f.vars.length === 1) {
          const t = bmt(f.table);
          const th = theta[f.vars[0]!]!;
          for (let x = 0; x < t.length; x++) th[x]! += t[x]!;
        } else if (f.vars.length === 2) ops.push(new PairwiseOp(fi, f.vars[0]!, f.vars[1]!, card[f.vars[0]!]!, card[f.vars[1]!]!, bmt(f.table)));
        else if (f.vars.length === 0) {
          /* constant factor: folded below */
        } else ops.push(new TableOp(fi, f.vars, Int32Array.from(f.vars.map((v) => card[v]!)), bmt(f.table)));
        break;
      case 'sameKey':
        if (f.weight === NEG) hasHard = true;
        if (f.weight !== 0) ops.push(new PottsOp(fi, f.a, f.b, bm(f.weight), keys, scratch));
        break;
      case 'sparsePair': {
        const entries: Array<[number, number, number]> = [];
        for (const [ka, kb, s] of f.entries) {
          const ga = groupOfKey(ka), gb = groupOfKey(kb);
          if (ga < 0 || gb < 0) continue; // key used by no variable: entry can never apply
          if (s === NEG) hasHard = true;
          entries.push([ga, gb, bm(s)]);
        }
        if (f.default === NEG) hasHard = true;
        ops.push(new SparseOp(fi, f.a, f.b, entries, bm(f.default), keys, scratch));
        break;
      }
      case 'allDifferent': {
        const p = f.penalty ?? NEG;
        if (p === NEG) hasHard = true;
        if (f.vars.length === 2) ops.push(new PottsOp(fi, f.vars[0]!, f.vars[1]!, bm(p), keys, scratch));
        else if (f.vars.length > 2) {
          // one counting constraint per key: "at most one holder" (or penalty per colliding pair);
          // counting sort over key groups into typed arrays
          const G = numGroups;
          const nSup = new Int32Array(G), nVar = new Int32Array(G), last = new Int32Array(G).fill(-1);
          for (const v of f.vars) {
            const g = group[v]!;
            for (let x = 0; x < g.length; x++) {
              const gi = g[x]!;
              if (gi === 0) continue;
              nSup[gi]!++;
              if (last[gi] !== v) {
                last[gi] = v;
                nVar[gi]!++;
              }
            }
          }
          const hv: (Int32Array | null)[] = new Array(G).fill(null), ho: (Int32Array | null)[] = new Array(G).fill(null), hs: (Int32Array | null)[] = new Array(G).fill(null);
          const cv = new Int32Array(G), cs = new Int32Array(G);
          for (let gi = 1; gi < G; gi++)
            if (nVar[gi]! >= 2) {
              hv[gi] = new Int32Array(nVar[gi]!);
              ho[gi] = new Int32Array(nVar[gi]! + 1);
              hs[gi] = new Int32Array(nSup[gi]!);
            }
          last.fill(-1);
          for (const v of f.vars) {
            const g = group[v]!;
            for (let x = 0; x < g.length; x++) {
              const gi = g[x]!;
              const vv = hv[gi];
              if (gi === 0 || !vv) continue;
              if (last[gi] !== v) {
                last[gi] = v;
                vv[cv[gi]!++] = v;
              }
              hs[gi]![cs[gi]!++] = x;
              ho[gi]![cv[gi]!] = cs[gi]!;
            }
          }
          for (let gi = 1; gi < G; gi++) {
            const vv = hv[gi];
            if (!vv) continue;
            if (p === NEG) {
              ops.push(new AtMostOneOp(fi, vv, ho[gi]!, hs[gi]!, card, H));
              continue;
            }
            const table: number[] = [];
            for (let c = 0; c <= vv.length; c++) table.push((p * c * (c - 1)) / 2);
            ops.push(new CountingOp(fi, vv, ho[gi]!, hs[gi]!, new Int32Array(hs[gi]!.length).fill(1), card, bmt(table), scratch));
          }
        }
        break;
      }
      case 'counting':
        {
          const op = countingOp(fi, f.vars, f.weights, countingTable(f));
          if (op) ops.push(op);
        }
        break;
    }
  });
  model.factors.forEach((f) => {
    if (f.kind === 'table' && f.vars.length === 0) constant += bm(f.table[0]!);
  });
  // adjacency as typed arrays (counting sort by variable): millions of slots on large rosters
  const deg = new Int32Array(n);
  for (const op of ops) for (let s = 0; s < op.vars.length; s++) deg[op.vars[s]!]!++;
  const adjOp = Array.from(deg, (d) => new Int32Array(d));
  const adjSlot = Array.from(deg, (d) => new Int32Array(d));
  const fill = new Int32Array(n);
  ops.forEach((op, oi) => {
    for (let s = 0; s < op.vars.length; s++) {
      const v = op.vars[s]!, k = fill[v]!++;
      adjOp[v]![k] = oi;
      adjSlot[v]![k] = s;
    }
  });
  return { model, n, card, theta, ops, adjOp, adjSlot, keys, scratch, H, constant, hasHard };
}

/** Big-M score of an assignment through the compiled operators (equals the model score when feasible). */
export function engineScore(E: Engine, x: Int32Array): number {
  let s = E.constant;
  for (let i = 0; i < E.n; i++) s += E.theta[i]![x[i]!]!;
  for (const op of E.ops) s += op.score(x);
  return s;
}

/** Log10 of the number of joint assignments. */
export function log10States(E: Engine): number {
  let s = 0;
  for (let i = 0; i < E.n; i++) s += Math.log10(E.card[i]!);
  return s;
}

/** True when the factor graph (variables + operators) has no cycle. */
export function isForest(E: Engine): boolean {
  // union-find over variable nodes and op nodes
  const parent = new Int32Array(E.n + E.ops.length).map((_, i) => i);
  const find = (a: number): number => {
    while (parent[a] !== a) {
      parent[a] = parent[parent[a]!]!;
      a = parent[a]!;
    }
    return a;
  };
  for (let o = 0; o < E.ops.length; o++) {
    for (const v of E.ops[o]!.vars) {
      const ra = find(v), rb = find(E.n + o);
      if (ra === rb) return false;
      parent[ra] = rb;
    }
  }
  return true;
}

/** Message state: one flat message array per operator and the variable beliefs b_i = θ_i + Σ messages. */
export interface MessageState {
  msg: Float64Array[];
  belief: Float64Array[];
  /** Per operator constant kept out of compact messages (dual bound bookkeeping). */
  opConst: Float64Array;
  /** Cached best states of each belief, so compact slots find their rest maximum in O(1). */
  tops: BeliefTops;
}

export function newMessageState(E: Engine): MessageState {
  // one backing buffer for all messages: views are cheap, separate buffers are not
  let total = 0;
  for (const op of E.ops) total += op.off[op.vars.length]!;
  const all = new Float64Array(total);
  let at = 0;
  const msg = E.ops.map((op) => {
    const len = op.off[op.vars.length]!;
    const v = all.subarray(at, at + len);
    at += len;
    return v;
  });
  const belief = E.theta.map((t) => Float64Array.from(t));
  return { msg, belief, opConst: new Float64Array(E.ops.length), tops: new BeliefTops(belief) };
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
      let p = len < TOP ? len++ : TOP - 1;
      while (p > 0 && this.val[o + p - 1]! < v) {
        this.val[o + p] = this.val[o + p - 1]!;
        this.idx[o + p] = this.idx[o + p - 1]!;
        p--;
      }
      this.val[o + p] = v;
      this.idx[o + p] = x;
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
      this.val[o + p] = v;
      while (p > 0 && this.val[o + p - 1]! < v) {
        this.val[o + p] = this.val[o + p - 1]!;
        this.idx[o + p] = this.idx[o + p - 1]!;
        this.val[o + p - 1] = v;
        this.idx[o + p - 1] = x;
        p--;
      }
      return;
    }
    if (len < TOP) {
      // fewer states than TOP are all listed already
      this.valid[i] = 0;
      return;
    }
    if (v <= this.val[o + TOP - 1]!) return;
    let q = TOP - 1;
    while (q > 0 && this.val[o + q - 1]! < v) {
      this.val[o + q] = this.val[o + q - 1]!;
      this.idx[o + q] = this.idx[o + q - 1]!;
      q--;
    }
    this.val[o + q] = v;
    this.idx[o + q] = x;
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
export class OpBuffers {
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
export function gatherIncoming(E: Engine, st: MessageState, oi: number, buf: OpBuffers, sum: boolean): void {
  const op = E.ops[oi]!;
  buf.prepare(op);
  const m = st.msg[oi]!, inc = buf.inc, off = op.off, sup = op.sup;
  for (let s = 0; s < op.vars.length; s++) {
    const b = st.belief[op.vars[s]!]!;
    const o = off[s]!;
    if (!sup) {
      for (let x = 0; x < b.length; x++) inc[o + x] = b[x]! - m[o + x]!;
      continue;
    }
    const e = off[s + 1]!;
    for (let k = o; k < e; k++) inc[k] = b[sup[k]!]! - m[k]!;
    buf.incRest[s] = op.restCount![s]! > 0 ? (sum ? restReduce(b, sup, o, e, true) : st.tops.restMax(op.vars[s]!, sup, o, e)) : NEG;
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
export function setSlot(E: Engine, st: MessageState, oi: number, s: number, nm: Float64Array): void {
  const op = E.ops[oi]!;
  const i = op.vars[s]!, m = st.msg[oi]!, b = st.belief[i]!;
  const o = op.off[s]!, e = op.off[s + 1]!, sup = op.sup;
  if (!sup) {
    for (let k = o; k < e; k++) {
      b[k - o]! += nm[k]! - m[k]!;
      m[k] = nm[k]!;
    }
    st.tops.dirty(i);
  } else
    for (let k = o; k < e; k++) {
      const x = sup[k]!;
      b[x]! += nm[k]! - m[k]!;
      m[k] = nm[k]!;
      st.tops.point(i, x, b[x]!);
    }
}

/** Argmax of each belief (lowest index on ties). */
export function decodeBeliefs(st: MessageState): Int32Array {
  return Int32Array.from(st.belief, (b) => {
    let bi = 0;
    for (let x = 1; x < b.length; x++) if (b[x]! > b[bi]!) bi = x;
    return bi;
  });
}

/** Model scope of factor fi (for reporting). */
export function factorScope(E: Engine, fi: number): number[] {
  return scopeOf(E.model.factors[fi]!);
}
