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
import { CountingOp, NEG, PairwiseOp, PottsOp, SparseOp, TableOp, type KeyInfo, type Op, type Scratch } from './ops';

export interface Engine {
  model: Model;
  n: number;
  card: Int32Array;
  /** Summed unary scores per variable (big-M applied). */
  theta: Float64Array[];
  ops: Op[];
  /** Per variable: list of [op index, slot]. */
  adj: Array<Array<[number, number]>>;
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

function countingTable(f: Factor & { kind: 'counting' }): number[] {
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
  const valuesOfGroup: Map<number, Int32Array>[] = [];
  for (const v of model.variables) {
    const g = new Int32Array(v.cardinality);
    const byG = new Map<number, number[]>();
    for (let x = 0; x < v.cardinality; x++) {
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
      if (!byG.has(gi)) byG.set(gi, []);
      byG.get(gi)!.push(x);
    }
    group.push(g);
    valuesOfGroup.push(new Map([...byG].map(([k, xs]) => [k, Int32Array.from(xs)])));
  }
  const numGroups = keyMap.size + 1;
  const keys: KeyInfo = { group, valuesOfGroup, numGroups };
  const scratch: Scratch = {
    groupA: new Float64Array(numGroups),
    groupB: new Float64Array(numGroups),
    stamp: new Int32Array(numGroups),
    stampNow: { v: 0 },
    dp: new Float64Array(1024),
  };
  const groupOfKey = (k: number): number => (k < 0 ? 0 : keyMap.get(k) ?? -1);

  const theta = model.variables.map((v) => new Float64Array(v.cardinality));
  const ops: Op[] = [];
  const countingOp = (fi: number, vars: number[], weights: Array<Array<[number, number]>>, table: number[]): CountingOp => {
    const support: Int32Array[] = [];
    const wts: Int32Array[] = [];
    weights.forEach((ws) => {
      const m = new Map<number, number>();
      for (const [x, w] of ws) if (w > 0) m.set(x, (m.get(x) ?? 0) + w);
      const xs = [...m.keys()].sort((a, b) => a - b);
      support.push(Int32Array.from(xs));
      wts.push(Int32Array.from(xs.map((x) => m.get(x)!)));
    });
    // clamp sums where the score stays constant from there on
    let S = table.length - 1;
    while (S > 0 && table[S - 1] === table[S]) S--;
    const g = bmt(table.slice(0, S + 1));
    return new CountingOp(fi, vars, support, wts, Int32Array.from(vars.map((v) => card[v]!)), g, scratch);
  };

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
          // one counting constraint per key: "at most one holder" (or penalty per colliding pair)
          const holders = new Map<number, Array<[number, number[]]>>();
          for (const v of f.vars) {
            for (const [g, xs] of valuesOfGroup[v]!) {
              if (g === 0) continue;
              if (!holders.has(g)) holders.set(g, []);
              holders.get(g)!.push([v, Array.from(xs)]);
            }
          }
          for (const [, hs] of holders) {
            if (hs.length < 2) continue;
            const table: number[] = [];
            for (let c = 0; c <= hs.length; c++) table.push(p === NEG ? (c <= 1 ? 0 : NEG) : (p * c * (c - 1)) / 2);
            ops.push(countingOp(fi, hs.map((h) => h[0]), hs.map((h) => h[1].map((x) => [x, 1] as [number, number])), table));
          }
        }
        break;
      }
      case 'counting':
        if (f.vars.length === 0) break;
        ops.push(countingOp(fi, f.vars, f.weights, countingTable(f)));
        break;
    }
  });
  let constant = model.constant ?? 0;
  model.factors.forEach((f) => {
    if (f.kind === 'table' && f.vars.length === 0) constant += bm(f.table[0]!);
    if (f.kind === 'counting' && f.vars.length === 0) constant += bm(countingScoreAt(f, 0));
  });
  const adj: Array<Array<[number, number]>> = model.variables.map(() => []);
  ops.forEach((op, oi) => op.vars.forEach((v, s) => adj[v]!.push([oi, s])));
  return { model, n, card, theta, ops, adj, keys, scratch, H, constant, hasHard };
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

/** Message state: one message per (operator, slot) and the variable beliefs b_i = θ_i + Σ messages. */
export interface MessageState {
  msg: Float64Array[][];
  belief: Float64Array[];
  /** Per operator constant kept out of compact messages (dual bound bookkeeping). */
  opConst: Float64Array;
}

export function newMessageState(E: Engine): MessageState {
  const msg = E.ops.map((op) => Array.from(op.vars, (v, s) => new Float64Array(op.support[s] ? op.support[s]!.length : E.card[v]!)));
  const belief = E.theta.map((t) => Float64Array.from(t));
  return { msg, belief, opConst: new Float64Array(E.ops.length) };
}

/** Reusable buffers for one operator update. */
export class OpBuffers {
  inc: Float64Array[] = [];
  out: Float64Array[] = [];
  incRest = new Float64Array(0);
  outRest = new Float64Array(0);
  private pool = new Map<number, Float64Array[]>();
  prepare(E: Engine, op: Op): void {
    const n = op.vars.length;
    if (this.incRest.length < n) {
      this.incRest = new Float64Array(n * 2);
      this.outRest = new Float64Array(n * 2);
    }
    this.inc.length = n;
    this.out.length = n;
    const used = new Map<number, number>();
    for (let s = 0; s < n; s++) {
      const len = op.support[s] ? op.support[s]!.length : E.card[op.vars[s]!]!;
      const k = used.get(len) ?? 0;
      used.set(len, k + 2);
      let arr = this.pool.get(len);
      if (!arr) this.pool.set(len, (arr = []));
      while (arr.length < k + 2) arr.push(new Float64Array(len));
      this.inc[s] = arr[k]!;
      this.out[s] = arr[k + 1]!;
    }
  }
}

/**
 * Fill buffers with incoming messages inc_s = b_i - m_{c→i} (in the operator's slot shape).
 * incRest = max (or log-sum-exp) of b_i over states outside a compact support.
 */
export function gatherIncoming(E: Engine, st: MessageState, oi: number, buf: OpBuffers, sum: boolean): void {
  const op = E.ops[oi]!;
  buf.prepare(E, op);
  const msgs = st.msg[oi]!;
  for (let s = 0; s < op.vars.length; s++) {
    const b = st.belief[op.vars[s]!]!, m = msgs[s]!, inc = buf.inc[s]!;
    const sup = op.support[s];
    if (!sup) {
      for (let x = 0; x < b.length; x++) inc[x] = b[x]! - m[x]!;
      continue;
    }
    for (let k = 0; k < sup.length; k++) inc[k] = b[sup[k]!]! - m[k]!;
    buf.incRest[s] = restReduce(b, sup, sum);
  }
}

/** max or log-sum-exp of v over indices not in the sorted list sup. */
export function restReduce(v: Float64Array, sup: Int32Array, sum: boolean): number {
  let acc = NEG, k = 0;
  if (!sum) {
    for (let x = 0; x < v.length; x++) {
      if (k < sup.length && sup[k] === x) {
        k++;
        continue;
      }
      if (v[x]! > acc) acc = v[x]!;
    }
    return acc;
  }
  let m = NEG;
  for (let x = 0; x < v.length; x++) {
    if (k < sup.length && sup[k] === x) {
      k++;
      continue;
    }
    if (v[x]! > m) m = v[x]!;
  }
  if (m === NEG) return NEG;
  k = 0;
  let s = 0;
  for (let x = 0; x < v.length; x++) {
    if (k < sup.length && sup[k] === x) {
      k++;
      continue;
    }
    s += Math.exp(v[x]! - m);
  }
  return m + Math.log(s);
}

/** Replace message (oi, s) by nm (same shape) and update the belief of its variable. */
export function setMessage(E: Engine, st: MessageState, oi: number, s: number, nm: Float64Array): void {
  const op = E.ops[oi]!;
  const m = st.msg[oi]![s]!, b = st.belief[op.vars[s]!]!;
  const sup = op.support[s];
  if (!sup) for (let x = 0; x < m.length; x++) b[x]! += nm[x]! - m[x]!;
  else for (let k = 0; k < sup.length; k++) b[sup[k]!]! += nm[k]! - m[k]!;
  m.set(nm);
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
