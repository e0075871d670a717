/**
 * Factor operators: the compiled form of model factors used by every
 * inference algorithm. Each operator offers one oracle, the factor-to-variable
 * message in max-sum or log-sum-exp form:
 *
 *   out_s(x_s) = ⊕_{x_c \ x_s} [ θ_c(x_c) + Σ_{t≠s} inc_t(x_t) ]     (⊕ = max or log-sum-exp)
 *
 * Layout: an operator's messages live in ONE flat Float64Array; slot s occupies
 * [off[s], off[s+1]). Dense operators (sup === null) hold one entry per state.
 * Compact operators hold entries only for the supported states sup[off[s]..off[s+1]);
 * all other states of the slot form one "rest" class (incRest[s] / outRest[s]),
 * so counting factors over many variables never store a K-vector per variable.
 * -Infinity scores are replaced by -H (big-M) before compilation; see engine.ts.
 */

export const NEG = -Infinity;

export function lse2(a: number, b: number): number {
  if (a === NEG) return b;
  if (b === NEG) return a;
  return a > b ? a + Math.log1p(Math.exp(b - a)) : b + Math.log1p(Math.exp(a - b));
}

export function lseRange(v: ArrayLike<number>, from = 0, to = v.length): number {
  let m = NEG;
  for (let i = from; i < to; i++) if (v[i]! > m) m = v[i]!;
  if (m === NEG || m === Infinity) return m;
  let s = 0;
  for (let i = from; i < to; i++) s += Math.exp(v[i]! - m);
  return m + Math.log(s);
}
export const lseArray = (v: ArrayLike<number>): number => lseRange(v);

export type Semiring = 'max' | 'sum';

/** Shared scratch space, sized once per engine. */
export interface Scratch {
  groupA: Float64Array;
  stamp: Int32Array;
  stampNow: { v: number };
  dp: Float64Array;
}

export interface Op {
  kind: string;
  /** Model factor index this operator comes from. */
  factor: number;
  vars: Int32Array;
  /** Slot offsets into the flat message (length arity + 1). */
  off: Int32Array;
  /** Compact support states (flat, aligned with messages) or null for dense operators. */
  sup: Int32Array | null;
  /** Compact operators: per slot, number of states outside the support. */
  restCount: Int32Array | null;
  message(sr: Semiring, inc: Float64Array, incRest: Float64Array, out: Float64Array, outRest: Float64Array): void;
  /** Big-M score of the operator at a full assignment. */
  score(x: Int32Array): number;
  /** Add to acc[v] the operator's score as a function of x[vars[slot]] = v, others as in x, up to a constant. */
  cond(slot: number, x: Int32Array, acc: Float64Array): void;
  /** An upper bound on the operator's score (its largest entry). */
  upper(): number;
}

function maxOf(t: ArrayLike<number>): number {
  let m = NEG;
  for (let i = 0; i < t.length; i++) if (t[i]! > m) m = t[i]!;
  return m;
}

/** Per-variable key information in dense form. */
export interface KeyInfo {
  /** value → key group (0 = no key, keys k ≥ 0 remapped to 1..P). */
  group: Int32Array[];
  /** variable → map group → first value with that group; nextSame[v][x] = next value of the same group or -1. */
  firstOfGroup: Map<number, number>[];
  nextSame: Int32Array[];
  numGroups: number;
}

function denseOffsets(cards: number[]): Int32Array {
  const off = new Int32Array(cards.length + 1);
  for (let j = 0; j < cards.length; j++) off[j + 1] = off[j]! + cards[j]!;
  return off;
}

// ---------------------------------------------------------------- dense pairwise

/** Dense pairwise table (row-major). O(K_a K_b) messages. */
export class PairwiseOp implements Op {
  kind = 'pairwise';
  vars: Int32Array;
  off: Int32Array;
  sup = null;
  restCount = null;
  constructor(public factor: number, a: number, b: number, private ka: number, private kb: number, private t: Float64Array) {
    this.vars = Int32Array.of(a, b);
    this.off = denseOffsets([ka, kb]);
  }
  message(sr: Semiring, inc: Float64Array, _ir: Float64Array, out: Float64Array, _or: Float64Array): void {
    const { ka, kb, t } = this;
    const o1 = ka;
    if (sr === 'max') {
      for (let b = 0; b < kb; b++) out[o1 + b] = NEG;
      for (let a = 0; a < ka; a++) {
        let best = NEG;
        const base = a * kb, ia = inc[a]!;
        for (let b = 0; b < kb; b++) {
          const v = t[base + b]!;
          const w = v + inc[o1 + b]!;
          if (w > best) best = w;
          const u = v + ia;
          if (u > out[o1 + b]!) out[o1 + b] = u;
        }
        out[a] = best;
      }
    } else {
      for (let a = 0; a < ka; a++) {
        let acc = NEG;
        for (let b = 0; b < kb; b++) acc = lse2(acc, t[a * kb + b]! + inc[o1 + b]!);
        out[a] = acc;
      }
      for (let b = 0; b < kb; b++) {
        let acc = NEG;
        for (let a = 0; a < ka; a++) acc = lse2(acc, t[a * kb + b]! + inc[a]!);
        out[o1 + b] = acc;
      }
    }
  }
  score(x: Int32Array): number {
    return this.t[x[this.vars[0]!]! * this.kb + x[this.vars[1]!]!]!;
  }
  upper(): number {
    return maxOf(this.t);
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

/** Dense table over any number of variables (last varies fastest). O(|table| · arity²) messages. */
export class TableOp implements Op {
  kind = 'table';
  vars: Int32Array;
  off: Int32Array;
  sup = null;
  restCount = null;
  private strides: Int32Array;
  constructor(public factor: number, vars: number[], private cards: Int32Array, private t: Float64Array) {
    this.vars = Int32Array.from(vars);
    this.off = denseOffsets(Array.from(cards));
    this.strides = new Int32Array(vars.length);
    let s = 1;
    for (let j = vars.length - 1; j >= 0; j--) {
      this.strides[j] = s;
      s *= cards[j]!;
    }
  }
  message(sr: Semiring, inc: Float64Array, _ir: Float64Array, out: Float64Array, _or: Float64Array): void {
    const n = this.vars.length, cards = this.cards, t = this.t, off = this.off;
    out.fill(NEG, 0, off[n]);
    const idx = new Int32Array(n);
    for (let e = 0; e < t.length; e++) {
      for (let j = 0; j < n; j++) {
        let v = t[e]!;
        for (let k = 0; k < n; k++) if (k !== j) v += inc[off[k]! + idx[k]!]!;
        const p = off[j]! + idx[j]!;
        out[p] = sr === 'max' ? (v > out[p]! ? v : out[p]!) : lse2(out[p]!, v);
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
  upper(): number {
    return maxOf(this.t);
  }
  cond(slot: number, x: Int32Array, acc: Float64Array): void {
    let e = 0;
    for (let j = 0; j < this.vars.length; j++) if (j !== slot) e += x[this.vars[j]!]! * this.strides[j]!;
    const stride = this.strides[slot]!;
    for (let v = 0; v < this.cards[slot]!; v++) acc[v]! += this.t[e + v * stride]!;
  }
}

// ---------------------------------------------------------------- key groups

/** Per-group reduction (max or log-sum-exp) of inc[from..] over one variable's values. */
function groupReduce(sr: Semiring, grp: Int32Array, inc: Float64Array, from: number, acc: Float64Array, stamp: Int32Array, now: number, present: number[]): void {
  present.length = 0;
  for (let x = 0; x < grp.length; x++) {
    const g = grp[x]!;
    const v = inc[from + x]!;
    if (stamp[g] !== now) {
      stamp[g] = now;
      acc[g] = v;
      present.push(g);
    } else acc[g] = sr === 'max' ? (v > acc[g]! ? v : acc[g]!) : lse2(acc[g]!, v);
  }
}

/**
 * Potts factor over keys: θ(xa, xb) = w when both keys are equal and non-negative, else 0.
 * Max message: out_b(xb) = max( max_{xa: key(xa) ≠ key(xb) or keyless} inc_a, G_a[key(xb)] + w ),
 * from the two best key groups: O(K_a + K_b).
 */
export class PottsOp implements Op {
  kind = 'potts';
  vars: Int32Array;
  off: Int32Array;
  sup = null;
  restCount = null;
  private present: number[] = [];
  constructor(public factor: number, a: number, b: number, public w: number, private keys: KeyInfo, private scratch: Scratch) {
    this.vars = Int32Array.of(a, b);
    this.off = denseOffsets([keys.group[a]!.length, keys.group[b]!.length]);
  }
  private one(sr: Semiring, fromSlot: number, inc: Float64Array, out: Float64Array): void {
    const keyInfo = this.keys, scratch = this.scratch, w = this.w;
    const toSlot = 1 - fromSlot;
    const gf = keyInfo.group[this.vars[fromSlot]!]!, gt = keyInfo.group[this.vars[toSlot]!]!;
    const fo = this.off[fromSlot]!, to = this.off[toSlot]!;
    const now = ++scratch.stampNow.v;
    const groupBest = scratch.groupA;
    groupReduce(sr, gf, inc, fo, groupBest, scratch.stamp, now, this.present);
    if (sr === 'max') {
      let b1 = NEG, g1 = -1, b2 = NEG, free = NEG;
      for (const g of this.present) {
        const v = groupBest[g]!;
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
      const all = b1 > free ? b1 : free;
      for (let x = 0; x < gt.length; x++) {
        const g = gt[x]!;
        if (g === 0 || scratch.stamp[g] !== now) {
          out[to + x] = all;
          continue;
        }
        const o = g === g1 ? b2 : b1;
        const other = free > o ? free : o;
        const same = groupBest[g]! + w;
        out[to + x] = other > same ? other : same;
      }
    } else {
      let total = NEG;
      for (const g of this.present) total = lse2(total, groupBest[g]!);
      const em1 = Math.expm1(w); // e^w - 1
      for (let x = 0; x < gt.length; x++) {
        const g = gt[x]!;
        if (g === 0 || scratch.stamp[g] !== now) {
          out[to + x] = total;
          continue;
        }
        const sg = groupBest[g]!;
        if (em1 >= 0) {
          out[to + x] = em1 === 0 ? total : lse2(total, sg + Math.log(em1));
          continue;
        }
        const frac = Math.exp(sg - total) * -em1;
        if (frac < 0.5) out[to + x] = total + Math.log1p(-frac);
        else {
          // cancellation risk: sum the other groups directly
          let other = NEG;
          for (const h of this.present) if (h !== g) other = lse2(other, groupBest[h]!);
          out[to + x] = lse2(other, sg + w);
        }
      }
    }
  }
  message(sr: Semiring, inc: Float64Array, _ir: Float64Array, out: Float64Array, _or: Float64Array): void {
    this.one(sr, 0, inc, out);
    this.one(sr, 1, inc, out);
  }
  score(x: Int32Array): number {
    const a = this.vars[0]!, b = this.vars[1]!;
    const ga = this.keys.group[a]![x[a]!]!;
    return ga !== 0 && ga === this.keys.group[b]![x[b]!]! ? this.w : 0;
  }
  upper(): number {
    return Math.max(0, this.w);
  }
  cond(slot: number, x: Int32Array, acc: Float64Array): void {
    const other = this.vars[1 - slot]!, self = this.vars[slot]!;
    const g = this.keys.group[other]![x[other]!]!;
    if (g === 0) return;
    const next = this.keys.nextSame[self]!;
    for (let v = this.keys.firstOfGroup[self]!.get(g) ?? -1; v >= 0; v = next[v]!) acc[v]! += this.w;
  }
}

/**
 * Sparse pairing table over key groups: θ = entry(g(xa), g(xb)) if listed, else default.
 * Max message to b: max( max_{listed (ga, g(xb))} G_a[ga] + s, default + best group of a not listed with g(xb) ),
 * the latter found among a's L+1 best groups (L = longest list): O(K·(L+1) + entries).
 */
export class SparseOp implements Op {
  kind = 'sparsePair';
  vars: Int32Array;
  off: Int32Array;
  sup = null;
  restCount = null;
  /** byGroup[0]: group of b → [group of a, score][]; byGroup[1]: group of a → [group of b, score][]. */
  private byGroup: [Map<number, Array<[number, number]>>, Map<number, Array<[number, number]>>];
  private lookup = new Map<number, number>();
  private present: number[] = [];
  constructor(public factor: number, a: number, b: number, entries: Array<[number, number, number]>, public def: number, private keys: KeyInfo, private scratch: Scratch) {
    this.vars = Int32Array.of(a, b);
    this.off = denseOffsets([keys.group[a]!.length, keys.group[b]!.length]);
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
    for (const l of toB.values()) if (l.length > this.maxList[0]) this.maxList[0] = l.length;
    for (const l of toA.values()) if (l.length > this.maxList[1]) this.maxList[1] = l.length;
  }
  private maxList: [number, number] = [0, 0];
  /** Per target slot and value: the entries listed for its group (built on first use). */
  private listsOf: [Array<Array<[number, number]> | null> | null, Array<Array<[number, number]> | null> | null] = [null, null];
  private topG = new Int32Array(0);
  private topV = new Float64Array(0);
  private one(sr: Semiring, fromSlot: 0 | 1, inc: Float64Array, out: Float64Array): void {
    const toSlot = 1 - fromSlot;
    const keyInfo = this.keys, scratch = this.scratch, def = this.def;
    const gf = keyInfo.group[this.vars[fromSlot]!]!, gt = keyInfo.group[this.vars[toSlot]!]!;
    const fo = this.off[fromSlot]!, to = this.off[toSlot]!;
    const now = ++scratch.stampNow.v;
    const groupBest = scratch.groupA;
    groupReduce(sr, gf, inc, fo, groupBest, scratch.stamp, now, this.present);
    const map = this.byGroup[fromSlot];
    let all = NEG;
    for (const h of this.present) all = sr === 'max' ? (groupBest[h]! > all ? groupBest[h]! : all) : lse2(all, groupBest[h]!);
    // the L+1 best groups, L = longest list: one of them is never listed with the target
    const L = this.maxList[fromSlot] + 1;
    let nTop = 0;
    if (sr === 'max' && map.size > 0) {
      if (this.topG.length < L) {
        this.topG = new Int32Array(L);
        this.topV = new Float64Array(L);
      }
      const tg = this.topG, tv = this.topV;
      for (const h of this.present) {
        const v = groupBest[h]!;
        if (nTop === L && v <= tv[L - 1]!) continue;
        let p = nTop < L ? nTop++ : L - 1;
        while (p > 0 && tv[p - 1]! < v) {
          tv[p] = tv[p - 1]!;
          tg[p] = tg[p - 1]!;
          p--;
        }
        tv[p] = v;
        tg[p] = h;
      }
    }
    let lists = this.listsOf[toSlot];
    if (!lists) lists = this.listsOf[toSlot] = Array.from(gt, (g) => map.get(g) ?? null);
    for (let x = 0; x < gt.length; x++) {
      const list = lists[x];
      if (!list) {
        out[to + x] = all + def;
        continue;
      }
      let r = NEG;
      if (sr === 'max') {
        for (const [h, sc] of list) if (scratch.stamp[h] === now && groupBest[h]! + sc > r) r = groupBest[h]! + sc;
        for (let q = 0; q < nTop; q++) {
          const h = this.topG[q]!;
          let listed = false;
          for (const e of list) if (e[0] === h) listed = true;
          if (!listed) {
            if (this.topV[q]! + def > r) r = this.topV[q]! + def;
            break;
          }
        }
      } else {
        // log( e^{all+def} + Σ_listed e^{G_h} (e^s - e^def) ), directly when cancellation threatens
        const base = all + def;
        let add = 0, sub = 0;
        for (const [h, sc] of list) {
          if (scratch.stamp[h] !== now) continue;
          add += Math.exp(groupBest[h]! + sc - base);
          sub += Math.exp(groupBest[h]! + def - base);
        }
        const val = 1 + add - sub;
        if (val > 1e-6 * (1 + add)) r = base + Math.log(val);
        else {
          for (const h of this.present) {
            let sc = def;
            for (const e of list) if (e[0] === h) sc = e[1];
            r = lse2(r, groupBest[h]! + sc);
          }
        }
      }
      out[to + x] = r;
    }
  }
  message(sr: Semiring, inc: Float64Array, _ir: Float64Array, out: Float64Array, _or: Float64Array): void {
    this.one(sr, 0, inc, out);
    this.one(sr, 1, inc, out);
  }
  private at(ga: number, gb: number): number {
    const s = this.lookup.get(ga * this.keys.numGroups + gb);
    return s === undefined ? this.def : s;
  }
  upper(): number {
    return Math.max(this.def, ...this.lookup.values());
  }
  score(x: Int32Array): number {
    const a = this.vars[0]!, b = this.vars[1]!;
    return this.at(this.keys.group[a]![x[a]!]!, this.keys.group[b]![x[b]!]!);
  }
  cond(slot: number, x: Int32Array, acc: Float64Array): void {
    const other = this.vars[1 - slot]!, self = this.vars[slot]!;
    const g = this.keys.group[other]![x[other]!]!;
    // slot 0 (a) varies: entries listed for b's group are in byGroup[0]
    const list = this.byGroup[slot === 0 ? 0 : 1].get(g);
    if (!list) return;
    for (const [h, s] of list) {
      const next = this.keys.nextSame[self]!;
      for (let v = this.keys.firstOfGroup[self]!.get(h) ?? -1; v >= 0; v = next[v]!) acc[v]! += s - this.def;
    }
  }
}

// ---------------------------------------------------------------- compact operators

/** Compact slot layout shared by counting-type operators. */
export abstract class CompactOp implements Op {
  abstract kind: string;
  vars: Int32Array;
  off: Int32Array;
  sup: Int32Array;
  /** Weight of each supported state (aligned with sup). */
  wts: Int32Array;
  restCount: Int32Array;
  /** Flat layout: slot j's supported states are sup[off[j]..off[j+1]) with weights wts (null = all 1). */
  constructor(public factor: number, vars: ArrayLike<number>, off: ArrayLike<number>, sup: ArrayLike<number>, wts: ArrayLike<number> | null, cards: ArrayLike<number>) {
    this.vars = Int32Array.from(vars);
    this.off = Int32Array.from(off);
    this.sup = Int32Array.from(sup);
    this.wts = wts ? Int32Array.from(wts) : new Int32Array(this.sup.length).fill(1);
    this.restCount = new Int32Array(this.vars.length);
    for (let j = 0; j < this.vars.length; j++) this.restCount[j] = cards[this.vars[j]!]! - (this.off[j + 1]! - this.off[j]!);
  }
  abstract message(sr: Semiring, inc: Float64Array, incRest: Float64Array, out: Float64Array, outRest: Float64Array): void;
  abstract g(sum: number): number;
  /** Sums from here on are forbidden (Infinity: none). */
  hardFrom = Infinity;
  /** Big-M value. */
  H = 0;
  /**
   * Score used by local search and engineScore: like g, but each unit past the hard
   * limit costs another H, so repairs see a gradient instead of a plateau.
   */
  gLocal(sum: number): number {
    return sum >= this.hardFrom ? -this.H * (1 + sum - this.hardFrom) : this.g(sum);
  }
  weightAt(slot: number, v: number): number {
    for (let k = this.off[slot]!; k < this.off[slot + 1]!; k++) if (this.sup[k] === v) return this.wts[k]!;
    return 0;
  }
  sumOf(x: Int32Array, skip: number): number {
    let s = 0;
    for (let j = 0; j < this.vars.length; j++) if (j !== skip) s += this.weightAt(j, x[this.vars[j]!]!);
    return s;
  }
  score(x: Int32Array): number {
    return this.gLocal(this.sumOf(x, -1));
  }
  abstract upper(): number;
  cond(slot: number, x: Int32Array, acc: Float64Array): void {
    this.condFromSum(slot, this.sumOf(x, slot), acc);
  }
  /** cond given the sum of the other slots. */
  condFromSum(slot: number, s0: number, acc: Float64Array): void {
    const base = this.gLocal(s0);
    for (let k = this.off[slot]!; k < this.off[slot + 1]!; k++) acc[this.sup[k]!]! += this.gLocal(s0 + this.wts[k]!) - base;
  }
}

/**
 * Counting factor θ = g(Σ_j w_j(x_j)). Messages by forward/backward dynamic programming
 * over sums clamped at lastSum (g is constant from lastSum on):
 *   F_{j+1}(min(t+w,lastSum)) ⊕= F_j(t) + h_j(w),   B_j(t) = ⊕_w h_j(w) + B_{j+1}(min(t+w,lastSum)),  B_n = g,
 *   out_j(w) = ⊕_t F_j(t) + B_{j+1}(min(t+w,lastSum)),
 * where h_j(w) ranges over the slot's supported states and the rest class (w = 0).
 * O(n · lastSum · (support + 1)).
 */
export class CountingOp extends CompactOp {
  kind = 'counting';
  lastSum: number;
  constructor(factor: number, vars: ArrayLike<number>, off: ArrayLike<number>, sup: ArrayLike<number>, wts: ArrayLike<number>, cards: ArrayLike<number>, public table: Float64Array, private scratch: Scratch) {
    super(factor, vars, off, sup, wts, cards);
    this.lastSum = table.length - 1;
  }
  g(sum: number): number {
    return this.table[sum > this.lastSum ? this.lastSum : sum]!;
  }
  upper(): number {
    return maxOf(this.table);
  }
  /** Graded local-search scores over 0..lastSum (hard sums cost H per unit of distance to an allowed sum). */
  localTable: Float64Array | null = null;
  /** Whether sums past lastSum are hard (then each extra unit costs another H). */
  tailHard = false;
  override gLocal(sum: number): number {
    const lt = this.localTable;
    if (!lt) return this.g(sum);
    if (sum <= this.lastSum) return lt[sum]!;
    return this.tailHard ? lt[this.lastSum]! - this.H * (sum - this.lastSum) : lt[this.lastSum]!;
  }
  message(sr: Semiring, inc: Float64Array, incRest: Float64Array, out: Float64Array, outRest: Float64Array): void {
    const n = this.vars.length, lastSum = this.lastSum, W = lastSum + 1, g = this.table, off = this.off, wts = this.wts;
    const need = 2 * (n + 1) * W;
    if (this.scratch.dp.length < need) this.scratch.dp = new Float64Array(need * 2);
    const dp = this.scratch.dp;
    const B = (n + 1) * W;
    const mx = sr === 'max';
    dp.fill(NEG, 0, need);
    dp[0] = 0;
    for (let j = 0; j < n; j++) {
      const src = j * W, dst = (j + 1) * W;
      const hasRest = this.restCount[j]! > 0, ir = incRest[j]!;
      for (let t = 0; t < W; t++) {
        const f = dp[src + t]!;
        if (f === NEG) continue;
        if (hasRest) {
          const v = f + ir;
          dp[dst + t] = mx ? (v > dp[dst + t]! ? v : dp[dst + t]!) : lse2(dp[dst + t]!, v);
        }
        for (let k = off[j]!; k < off[j + 1]!; k++) {
          const u = t + wts[k]! > lastSum ? lastSum : t + wts[k]!;
          const v = f + inc[k]!;
          dp[dst + u] = mx ? (v > dp[dst + u]! ? v : dp[dst + u]!) : lse2(dp[dst + u]!, v);
        }
      }
    }
    for (let t = 0; t < W; t++) dp[B + n * W + t] = g[t]!;
    for (let j = n - 1; j >= 0; j--) {
      const nxt = B + (j + 1) * W, cur = B + j * W;
      const hasRest = this.restCount[j]! > 0, ir = incRest[j]!;
      for (let t = 0; t < W; t++) {
        let acc = hasRest ? ir + dp[nxt + t]! : NEG;
        for (let k = off[j]!; k < off[j + 1]!; k++) {
          const u = t + wts[k]! > lastSum ? lastSum : t + wts[k]!;
          const v = inc[k]! + dp[nxt + u]!;
          acc = mx ? (v > acc ? v : acc) : lse2(acc, v);
        }
        dp[cur + t] = acc;
      }
    }
    for (let j = 0; j < n; j++) {
      const f = j * W, nb = B + (j + 1) * W;
      let rest = NEG;
      for (let k = off[j]!; k < off[j + 1]!; k++) out[k] = NEG;
      for (let t = 0; t < W; t++) {
        const ft = dp[f + t]!;
        if (ft === NEG) continue;
        const v0 = ft + dp[nb + t]!;
        rest = mx ? (v0 > rest ? v0 : rest) : lse2(rest, v0);
        for (let k = off[j]!; k < off[j + 1]!; k++) {
          const u = t + wts[k]! > lastSum ? lastSum : t + wts[k]!;
          const v = ft + dp[nb + u]!;
          out[k] = mx ? (v > out[k]! ? v : out[k]!) : lse2(out[k]!, v);
        }
      }
      outRest[j] = rest;
    }
  }
}

/**
 * "At most one holder": among the slots, at most one takes a supported state
 * (one key of an n-ary all-different). θ = 0 if ≤ 1 holder, else -H. With r_k the
 * rest entry and a_k = ⊕ of the supported entries of slot k, R = Σ_k r_k:
 *   max: out_j(support) = R - r_j,  out_j(rest) = R - r_j + max(0, max_{k≠j} (a_k - r_k))
 *   sum: out_j(support) = R - r_j,  out_j(rest) = R - r_j + log(1 + Σ_{k≠j} e^{a_k - r_k})
 * ignoring the -H mass of two or more holders (below double precision at H ≥ 1000). O(n).
 */
export class AtMostOneOp extends CompactOp {
  kind = 'atMostOne';
  private d: Float64Array;
  constructor(factor: number, vars: ArrayLike<number>, off: ArrayLike<number>, sup: ArrayLike<number>, cards: ArrayLike<number>, H: number) {
    super(factor, vars, off, sup, null, cards);
    this.H = H;
    this.hardFrom = 2;
    this.d = new Float64Array(vars.length);
  }
  g(sum: number): number {
    return sum <= 1 ? 0 : -this.H;
  }
  upper(): number {
    return 0;
  }
  message(sr: Semiring, inc: Float64Array, incRest: Float64Array, out: Float64Array, outRest: Float64Array): void {
    const n = this.vars.length, off = this.off, d = this.d;
    let R = 0;
    // a slot without rest states must hold: r = -H keeps the arithmetic finite
    for (let j = 0; j < n; j++) {
      const r = this.restCount[j]! > 0 ? incRest[j]! : -this.H;
      let a = NEG;
      for (let k = off[j]!; k < off[j + 1]!; k++) a = sr === 'max' ? (inc[k]! > a ? inc[k]! : a) : lse2(a, inc[k]!);
      R += r;
      d[j] = a - r;
    }
    if (sr === 'max') {
      let b1 = 0, j1 = -1, b2 = 0; // max(0, ·) folded in
      for (let j = 0; j < n; j++) {
        if (d[j]! > b1) {
          b2 = b1;
          b1 = d[j]!;
          j1 = j;
        } else if (d[j]! > b2) b2 = d[j]!;
      }
      for (let j = 0; j < n; j++) {
        const r = this.restCount[j]! > 0 ? incRest[j]! : -this.H;
        const base = R - r;
        for (let k = off[j]!; k < off[j + 1]!; k++) out[k] = base;
        outRest[j] = base + (j === j1 ? b2 : b1);
      }
    } else {
      // log(1 + Σ_{k≠j} e^{d_k}) via a shared maximum
      let m = 0;
      for (let j = 0; j < n; j++) if (d[j]! > m) m = d[j]!;
      let tot = Math.exp(-m);
      for (let j = 0; j < n; j++) tot += Math.exp(d[j]! - m);
      for (let j = 0; j < n; j++) {
        const r = this.restCount[j]! > 0 ? incRest[j]! : -this.H;
        const base = R - r;
        for (let k = off[j]!; k < off[j + 1]!; k++) out[k] = base;
        const rem = tot - Math.exp(d[j]! - m);
        let l: number;
        if (rem > 1e-12 * tot) l = m + Math.log(rem);
        else {
          let s = NEG;
          for (let k = 0; k < n; k++) if (k !== j) s = lse2(s, d[k]!);
          l = lse2(0, s);
        }
        outRest[j] = base + l;
      }
    }
  }
}
