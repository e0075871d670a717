/**
 * Factor operators: the compiled form of model factors used by every
 * inference algorithm. Each operator offers one oracle, the factor-to-variable
 * message in max-sum or log-sum-exp form:
 *
 *   out_s(x_s) = ⊕_{x_c \ x_s} [ θ_c(x_c) + Σ_{t≠s} inc_t(x_t) ]     (⊕ = max or log-sum-exp)
 *
 * Slots are either dense (a value per state) or compact: a support list of the
 * states the factor distinguishes, all other states sharing one "rest" entry
 * (incRest / outRest). Compact slots keep counting factors over many variables
 * from storing a K-vector per (factor, variable). -Infinity scores are replaced by
 * -H (big-M) before compilation; see engine.ts.
 */

export const NEG = -Infinity;

export function lse2(a: number, b: number): number {
  if (a === NEG) return b;
  if (b === NEG) return a;
  return a > b ? a + Math.log1p(Math.exp(b - a)) : b + Math.log1p(Math.exp(a - b));
}

export function lseArray(v: ArrayLike<number>): number {
  let m = NEG;
  for (let i = 0; i < v.length; i++) if (v[i]! > m) m = v[i]!;
  if (m === NEG || m === Infinity) return m;
  let s = 0;
  for (let i = 0; i < v.length; i++) s += Math.exp(v[i]! - m);
  return m + Math.log(s);
}

export type Semiring = 'max' | 'sum';

/** Shared scratch space, sized once per engine. */
export interface Scratch {
  /** Per-group accumulators indexed by key group (size numGroups). */
  groupA: Float64Array;
  groupB: Float64Array;
  stamp: Int32Array;
  stampNow: { v: number };
  dp: Float64Array;
}

export interface Op {
  kind: string;
  /** Model factor index this operator comes from. */
  factor: number;
  vars: Int32Array;
  /** Per slot: supported states (compact) or null (dense). */
  support: (Int32Array | null)[];
  /** Per slot: number of states NOT in the support (0 for dense). */
  restCount: Int32Array;
  message(sr: Semiring, inc: Float64Array[], incRest: Float64Array, out: Float64Array[], outRest: Float64Array): void;
  /** Big-M score of the operator at a full assignment. */
  score(x: Int32Array): number;
  /** Add to acc[v] the operator's score as a function of x[vars[slot]] = v, others as in x, up to a constant. */
  cond(slot: number, x: Int32Array, acc: Float64Array): void;
}

/** Per-variable key information in dense form. */
export interface KeyInfo {
  /** value → key group (key + 1 remapped densely; 0 = no key). */
  group: Int32Array[];
  /** variable → map group → values with that group. */
  valuesOfGroup: Map<number, Int32Array>[];
  numGroups: number;
}

// ---------------------------------------------------------------- dense pairwise

export class PairwiseOp implements Op {
  kind = 'pairwise';
  vars: Int32Array;
  support: (Int32Array | null)[] = [null, null];
  restCount = new Int32Array(2);
  constructor(public factor: number, a: number, b: number, private ka: number, private kb: number, private t: Float64Array) {
    this.vars = Int32Array.of(a, b);
  }
  message(sr: Semiring, inc: Float64Array[], _ir: Float64Array, out: Float64Array[], _or: Float64Array): void {
    const { ka, kb, t } = this;
    const i0 = inc[0]!, i1 = inc[1]!, o0 = out[0]!, o1 = out[1]!;
    if (sr === 'max') {
      o1.fill(NEG);
      for (let a = 0; a < ka; a++) {
        let best = NEG;
        const base = a * kb, ia = i0[a]!;
        for (let b = 0; b < kb; b++) {
          const v = t[base + b]!;
          const w = v + i1[b]!;
          if (w > best) best = w;
          const u = v + ia;
          if (u > o1[b]!) o1[b] = u;
        }
        o0[a] = best;
      }
    } else {
      for (let a = 0; a < ka; a++) {
        let acc = NEG;
        for (let b = 0; b < kb; b++) acc = lse2(acc, t[a * kb + b]! + i1[b]!);
        o0[a] = acc;
      }
      for (let b = 0; b < kb; b++) {
        let acc = NEG;
        for (let a = 0; a < ka; a++) acc = lse2(acc, t[a * kb + b]! + i0[a]!);
        o1[b] = acc;
      }
    }
  }
  score(x: Int32Array): number {
    return this.t[x[this.vars[0]!]! * this.kb + x[this.vars[1]!]!]!;
  }
  cond(slot: number, x: Int32Array, acc: Float64Array): void {
    const { ka, kb, t } = this;
    if (slot === 0) {
      const b = x[this.vars[1]!]!;
      for (let a = 0; a < ka; a++) acc[a]! += t[a * kb + b]!;
    } else {
      const base = x[this.vars[0]!]! * kb;
      for (let b = 0; b < kb; b++) acc[b]! += t[base + b]!;
    }
  }
}

// ---------------------------------------------------------------- dense n-ary table

export class TableOp implements Op {
  kind = 'table';
  vars: Int32Array;
  support: (Int32Array | null)[];
  restCount: Int32Array;
  private strides: Int32Array;
  constructor(public factor: number, vars: number[], private cards: Int32Array, private t: Float64Array) {
    this.vars = Int32Array.from(vars);
    this.support = vars.map(() => null);
    this.restCount = new Int32Array(vars.length);
    this.strides = new Int32Array(vars.length);
    let s = 1;
    for (let j = vars.length - 1; j >= 0; j--) {
      this.strides[j] = s;
      s *= cards[j]!;
    }
  }
  message(sr: Semiring, inc: Float64Array[], _ir: Float64Array, out: Float64Array[], _or: Float64Array): void {
    const n = this.vars.length, cards = this.cards, t = this.t;
    for (let j = 0; j < n; j++) out[j]!.fill(NEG);
    const idx = new Int32Array(n);
    for (let e = 0; e < t.length; e++) {
      let total = t[e]!;
      for (let j = 0; j < n; j++) total += inc[j]![idx[j]!]!;
      if (total !== NEG || sr === 'sum') {
        for (let j = 0; j < n; j++) {
          const xj = idx[j]!;
          // total minus own incoming, recomputed to avoid -Inf - -Inf
          let v = t[e]!;
          for (let k = 0; k < n; k++) if (k !== j) v += inc[k]![idx[k]!]!;
          const o = out[j]!;
          o[xj] = sr === 'max' ? (v > o[xj]! ? v : o[xj]!) : lse2(o[xj]!, v);
        }
      }
      for (let j = n - 1; j >= 0; j--) {
        if (++idx[j]! < cards[j]!) break;
        idx[j] = 0;
      }
    }
  }
  score(x: Int32Array): number {
    let e = 0;
    for (let j = 0; j < this.vars.length; j++) e += x[this.vars[j]!]! * this.strides[j]!;
    return this.t[e]!;
  }
  cond(slot: number, x: Int32Array, acc: Float64Array): void {
    let e = 0;
    for (let j = 0; j < this.vars.length; j++) if (j !== slot) e += x[this.vars[j]!]! * this.strides[j]!;
    const st = this.strides[slot]!;
    for (let v = 0; v < this.cards[slot]!; v++) acc[v]! += this.t[e + v * st]!;
  }
}

// ---------------------------------------------------------------- key groups

/** Per-group reduction (max or log-sum-exp) of inc over one variable's values; returns groups present. */
function groupReduce(sr: Semiring, grp: Int32Array, inc: Float64Array, acc: Float64Array, stamp: Int32Array, now: number, present: number[]): void {
  present.length = 0;
  for (let x = 0; x < grp.length; x++) {
    const g = grp[x]!;
    const v = inc[x]!;
    if (stamp[g] !== now) {
      stamp[g] = now;
      acc[g] = v;
      present.push(g);
    } else acc[g] = sr === 'max' ? (v > acc[g]! ? v : acc[g]!) : lse2(acc[g]!, v);
  }
}

/**
 * Potts factor over keys: θ(xa, xb) = w when both keys are equal and non-negative, else 0.
 * Max message: out_b(xb) = max( max_{xa: g(xa) ≠ g(xb) or no key} inc_a, G_a[g(xb)] + w ) using the
 * two best key groups, O(K_a + K_b).
 */
export class PottsOp implements Op {
  kind = 'potts';
  vars: Int32Array;
  support: (Int32Array | null)[] = [null, null];
  restCount = new Int32Array(2);
  private present: number[] = [];
  constructor(public factor: number, a: number, b: number, public w: number, private keys: KeyInfo, private scratch: Scratch) {
    this.vars = Int32Array.of(a, b);
  }
  private one(sr: Semiring, from: number, to: number, inc: Float64Array, out: Float64Array): void {
    const K = this.keys, S = this.scratch, w = this.w;
    const gf = K.group[from]!, gt = K.group[to]!;
    const now = ++S.stampNow.v;
    const G = S.groupA;
    groupReduce(sr, gf, inc, G, S.stamp, now, this.present);
    if (sr === 'max') {
      // best and second-best keyed groups, and best keyless value
      let b1 = NEG, g1 = -1, b2 = NEG, free = NEG;
      for (const g of this.present) {
        const v = G[g]!;
        if (g === 0) {
          free = v;
          continue;
        }
        if (v > b1) {
          b2 = b1;
          b1 = v;
          g1 = g;
        } else if (v > b2) b2 = v;
      }
      const all = Math.max(b1, free);
      for (let x = 0; x < gt.length; x++) {
        const g = gt[x]!;
        if (g === 0 || S.stamp[g] !== now) {
          out[x] = all;
          continue;
        }
        const other = Math.max(free, g === g1 ? b2 : b1);
        const same = G[g]! + w;
        out[x] = other > same ? other : same;
      }
    } else {
      let total = NEG;
      for (const g of this.present) total = lse2(total, G[g]!);
      const em1 = Math.expm1(w); // e^w - 1
      for (let x = 0; x < gt.length; x++) {
        const g = gt[x]!;
        if (g === 0 || S.stamp[g] !== now) {
          out[x] = total;
          continue;
        }
        const sg = G[g]!;
        if (em1 >= 0) {
          out[x] = em1 === 0 ? total : lse2(total, sg + Math.log(em1));
          continue;
        }
        const frac = Math.exp(sg - total) * -em1;
        if (frac < 0.5) out[x] = total + Math.log1p(-frac);
        else {
          // cancellation risk: sum the other groups directly
          let other = NEG;
          for (const h of this.present) if (h !== g) other = lse2(other, G[h]!);
          out[x] = lse2(other, sg + w);
        }
      }
    }
  }
  message(sr: Semiring, inc: Float64Array[], _ir: Float64Array, out: Float64Array[], _or: Float64Array): void {
    this.one(sr, this.vars[0]!, this.vars[1]!, inc[0]!, out[1]!);
    this.one(sr, this.vars[1]!, this.vars[0]!, inc[1]!, out[0]!);
  }
  score(x: Int32Array): number {
    const a = this.vars[0]!, b = this.vars[1]!;
    const ga = this.keys.group[a]![x[a]!]!;
    return ga !== 0 && ga === this.keys.group[b]![x[b]!]! ? this.w : 0;
  }
  cond(slot: number, x: Int32Array, acc: Float64Array): void {
    const other = this.vars[1 - slot]!, self = this.vars[slot]!;
    const g = this.keys.group[other]![x[other]!]!;
    if (g === 0) return;
    const vals = this.keys.valuesOfGroup[self]!.get(g);
    if (vals) for (const v of vals) acc[v]! += this.w;
  }
}

/**
 * Sparse pairing table over key groups: θ = entry(g(xa), g(xb)) if listed, else default.
 * Max message to b: max( max_{entries (ga, g(xb))} G_a[ga] + s, default + best group of a not listed with g(xb) ),
 * O(K log K + entries).
 */
export class SparseOp implements Op {
  kind = 'sparsePair';
  vars: Int32Array;
  support: (Int32Array | null)[] = [null, null];
  restCount = new Int32Array(2);
  /** byGroup[dir]: target group → list of [source group, score] (dir 0: a→b keyed by gb). */
  private byGroup: [Map<number, Array<[number, number]>>, Map<number, Array<[number, number]>>];
  private lookup = new Map<number, number>();
  private present: number[] = [];
  constructor(public factor: number, a: number, b: number, entries: Array<[number, number, number]>, public def: number, private keys: KeyInfo, private scratch: Scratch) {
    this.vars = Int32Array.of(a, b);
    const toB = new Map<number, Array<[number, number]>>();
    const toA = new Map<number, Array<[number, number]>>();
    const ng = keys.numGroups;
    for (const [ga, gb, s] of entries) {
      const k = ga * ng + gb;
      if (this.lookup.has(k)) continue; // first listed entry wins, as in factorScore
      this.lookup.set(k, s);
      if (!toB.has(gb)) toB.set(gb, []);
      toB.get(gb)!.push([ga, s]);
      if (!toA.has(ga)) toA.set(ga, []);
      toA.get(ga)!.push([gb, s]);
    }
    this.byGroup = [toB, toA];
  }
  private one(sr: Semiring, dir: 0 | 1, inc: Float64Array, out: Float64Array): void {
    const from = this.vars[dir]!, to = this.vars[1 - dir]!;
    const K = this.keys, S = this.scratch, def = this.def;
    const gf = K.group[from]!, gt = K.group[to]!;
    const now = ++S.stampNow.v;
    const G = S.groupA;
    groupReduce(sr, gf, inc, G, S.stamp, now, this.present);
    const map = this.byGroup[dir];
    const R = S.groupB; // per target group result cache (stamped with `now` via sign trick below)
    const done = new Map<number, number>();
    let sorted: number[] | null = null;
    let total = NEG;
    if (sr === 'sum') for (const g of this.present) total = lse2(total, G[g]!);
    for (let x = 0; x < gt.length; x++) {
      const g = gt[x]!;
      const cached = done.get(g);
      if (cached !== undefined) {
        out[x] = cached;
        continue;
      }
      const list = map.get(g);
      let r: number;
      if (sr === 'max') {
        if (!list) {
          let m = NEG;
          for (const h of this.present) if (G[h]! > m) m = G[h]!;
          r = m + def;
        } else {
          let best = NEG;
          const listed = new Set<number>();
          for (const [h, s] of list) {
            listed.add(h);
            if (S.stamp[h] === now && G[h]! + s > best) best = G[h]! + s;
          }
          if (!sorted) sorted = [...this.present].sort((p, q) => G[q]! - G[p]!);
          for (const h of sorted)
            if (!listed.has(h)) {
              if (G[h]! + def > best) best = G[h]! + def;
              break;
            }
          r = best;
        }
      } else {
        // log( e^def·Σ_all + Σ_listed S_h (e^s - e^def) ), computed directly over groups
        let acc = NEG;
        const listed = new Map<number, number>();
        if (list) for (const [h, s] of list) listed.set(h, s);
        for (const h of this.present) acc = lse2(acc, G[h]! + (listed.get(h) ?? def));
        r = acc;
      }
      R[0] = r;
      done.set(g, r);
      out[x] = r;
    }
  }
  message(sr: Semiring, inc: Float64Array[], _ir: Float64Array, out: Float64Array[], _or: Float64Array): void {
    this.one(sr, 0, inc[0]!, out[1]!);
    this.one(sr, 1, inc[1]!, out[0]!);
  }
  private at(ga: number, gb: number): number {
    const s = this.lookup.get(ga * this.keys.numGroups + gb);
    return s === undefined ? this.def : s;
  }
  score(x: Int32Array): number {
    const a = this.vars[0]!, b = this.vars[1]!;
    return this.at(this.keys.group[a]![x[a]!]!, this.keys.group[b]![x[b]!]!);
  }
  cond(slot: number, x: Int32Array, acc: Float64Array): void {
    const other = this.vars[1 - slot]!, self = this.vars[slot]!;
    const g = this.keys.group[other]![x[other]!]!;
    // entries keyed by the other variable's group: dir 0 lists (ga) for target gb
    const list = this.byGroup[slot === 0 ? 0 : 1].get(g);
    if (!list) return;
    for (const [h, s] of list) {
      const vals = this.keys.valuesOfGroup[self]!.get(h);
      if (vals) for (const v of vals) acc[v]! += s - this.def;
    }
  }
}

// ---------------------------------------------------------------- counting

/**
 * Counting factor θ = g(Σ_j w_j(x_j)) with compact slots: the support of slot j lists
 * the states with non-zero weight; all others weigh 0 and share the rest entry.
 * Messages by forward/backward dynamic programming over clamped sums 0..S:
 *   F_{j+1}(min(t+w,S)) ⊕= F_j(t) + h_j(w),   B_j(t) = ⊕_w h_j(w) + B_{j+1}(min(t+w,S)),  B_n = g,
 *   out_j(w) = ⊕_t F_j(t) + B_{j+1}(min(t+w,S)).
 * O(n · S · (support+1)). S is clamped where g becomes constant, so caps cost O(cap).
 */
export class CountingOp implements Op {
  kind = 'counting';
  vars: Int32Array;
  support: (Int32Array | null)[];
  restCount: Int32Array;
  /** weights per slot aligned with support. */
  wts: Int32Array[];
  /** Largest clamped sum. */
  S: number;
  constructor(public factor: number, vars: number[], support: Int32Array[], wts: Int32Array[], cards: Int32Array, public g: Float64Array, private scratch: Scratch) {
    this.vars = Int32Array.from(vars);
    this.support = support;
    this.wts = wts;
    this.restCount = Int32Array.from(support.map((s, j) => cards[j]! - s.length));
    this.S = g.length - 1;
  }
  private clampSum(t: number): number {
    return t > this.S ? this.S : t;
  }
  message(sr: Semiring, inc: Float64Array[], incRest: Float64Array, out: Float64Array[], outRest: Float64Array): void {
    const n = this.vars.length, S = this.S, W = S + 1, g = this.g;
    const need = 2 * (n + 1) * W;
    if (this.scratch.dp.length < need) this.scratch.dp = new Float64Array(need * 2);
    const dp = this.scratch.dp;
    const F = 0, B = (n + 1) * W;
    const mx = sr === 'max';
    dp.fill(NEG, 0, need);
    dp[F] = 0;
    for (let j = 0; j < n; j++) {
      const src = F + j * W, dst = F + (j + 1) * W;
      const sup = this.support[j]!, w = this.wts[j]!, vj = inc[j]!;
      const hasRest = this.restCount[j]! > 0;
      for (let t = 0; t < W; t++) {
        const f = dp[src + t]!;
        if (f === NEG) continue;
        if (hasRest) {
          const v = f + incRest[j]!;
          dp[dst + t] = mx ? (v > dp[dst + t]! ? v : dp[dst + t]!) : lse2(dp[dst + t]!, v);
        }
        for (let k = 0; k < sup.length; k++) {
          const u = t + w[k]! > S ? S : t + w[k]!;
          const v = f + vj[k]!;
          dp[dst + u] = mx ? (v > dp[dst + u]! ? v : dp[dst + u]!) : lse2(dp[dst + u]!, v);
        }
      }
    }
    for (let t = 0; t < W; t++) dp[B + n * W + t] = g[t]!;
    for (let j = n - 1; j >= 0; j--) {
      const nxt = B + (j + 1) * W, cur = B + j * W;
      const sup = this.support[j]!, w = this.wts[j]!, vj = inc[j]!;
      const hasRest = this.restCount[j]! > 0;
      for (let t = 0; t < W; t++) {
        let acc = hasRest ? incRest[j]! + dp[nxt + t]! : NEG;
        for (let k = 0; k < sup.length; k++) {
          const u = t + w[k]! > S ? S : t + w[k]!;
          const v = vj[k]! + dp[nxt + u]!;
          acc = mx ? (v > acc ? v : acc) : lse2(acc, v);
        }
        dp[cur + t] = acc;
      }
    }
    for (let j = 0; j < n; j++) {
      const f = F + j * W, nb = B + (j + 1) * W;
      const sup = this.support[j]!, w = this.wts[j]!, o = out[j]!;
      let rest = NEG;
      const ok = new Float64Array(sup.length).fill(NEG);
      for (let t = 0; t < W; t++) {
        const ft = dp[f + t]!;
        if (ft === NEG) continue;
        const v0 = ft + dp[nb + t]!;
        rest = mx ? (v0 > rest ? v0 : rest) : lse2(rest, v0);
        for (let k = 0; k < sup.length; k++) {
          const u = t + w[k]! > S ? S : t + w[k]!;
          const v = ft + dp[nb + u]!;
          ok[k] = mx ? (v > ok[k]! ? v : ok[k]!) : lse2(ok[k]!, v);
        }
      }
      o.set(ok);
      outRest[j] = rest;
    }
  }
  private sumOf(x: Int32Array, skip: number): number {
    let s = 0;
    for (let j = 0; j < this.vars.length; j++) {
      if (j === skip) continue;
      const xv = x[this.vars[j]!]!, sup = this.support[j]!;
      for (let k = 0; k < sup.length; k++) if (sup[k] === xv) s += this.wts[j]![k]!;
    }
    return s;
  }
  score(x: Int32Array): number {
    return this.g[this.clampSum(this.sumOf(x, -1))]!;
  }
  cond(slot: number, x: Int32Array, acc: Float64Array): void {
    const s0 = this.sumOf(x, slot);
    const base = this.g[this.clampSum(s0)]!;
    const sup = this.support[slot]!, w = this.wts[slot]!;
    for (let k = 0; k < sup.length; k++) acc[sup[k]!]! += this.g[this.clampSum(s0 + w[k]!)]! - base;
  }
}
