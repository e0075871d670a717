/**
 * Local improvement of an assignment on the big-M model: single-variable moves
 * (iterated conditional modes) and swap / ejection moves over keys (a takes the
 * key held by b, b moves to its best value given that). Every accepted step
 * raises the big-M score, so hard-constraint breaches are repaired first and a
 * feasible assignment never becomes infeasible.
 */
import type { Engine } from './engine';
import { engineScore } from './engine';
import { CompactOp } from './factor-operators';

/** Small deterministic PRNG (mulberry32). */
export function rng(seed: number): () => number {
  let a = seed >>> 0 || 0x9e3779b9;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export function shuffle<T>(a: T[], r: () => number): T[] {
  for (let i = a.length - 1; i > 0; i--) {
    const j = Math.floor(r() * (i + 1));
    [a[i], a[j]] = [a[j]!, a[i]!];
  }
  return a;
}

const EPS = 1e-9;

export class LocalSearch {
  readonly x: Int32Array;
  private acc: Float64Array;
  private acc2: Float64Array;
  /** key group → variables currently holding it. */
  private holders = new Map<number, Set<number>>();
  /** Cached sums for counting operators (index → sum). */
  private sums: Float64Array;
  private counting: boolean[];

  /** Variables local search must not change (pins, forced alternatives). */
  fixed: Uint8Array;

  constructor(private engine: Engine, x: ArrayLike<number>, private random: () => number, fixed?: Uint8Array) {
    this.fixed = fixed ?? new Uint8Array(engine.n);
    this.x = Int32Array.from(x);
    let maxK = 1;
    for (let i = 0; i < engine.n; i++) if (engine.card[i]! > maxK) maxK = engine.card[i]!;
    this.acc = new Float64Array(maxK);
    this.acc2 = new Float64Array(maxK);
    this.sums = new Float64Array(engine.ops.length);
    this.counting = engine.ops.map((op) => op instanceof CompactOp);
    for (let i = 0; i < engine.n; i++) this.hold(i, this.x[i]!, true);
    engine.ops.forEach((op, oi) => {
      if (op instanceof CompactOp) this.sums[oi] = op.sumOf(this.x, -1);
    });
  }

  private hold(i: number, v: number, add: boolean): void {
    const g = this.engine.keys.group[i]![v]!;
    if (g === 0) return;
    let s = this.holders.get(g);
    if (!s) this.holders.set(g, (s = new Set()));
    if (add) s.add(i);
    else s.delete(i);
  }

  /** acc[v] = score as a function of x_i = v, others fixed, up to a constant. */
  local(i: number, acc: Float64Array): void {
    const engine = this.engine;
    // theta[i] has the variable's cardinality: copied as it is, no view per call
    acc.set(engine.theta[i]!);
    const ao = engine.adjOp[i]!, as = engine.adjSlot[i]!;
    for (let k = 0; k < ao.length; k++) {
      const oi = ao[k]!, s = as[k]!;
      const op = engine.ops[oi]!;
      if (this.counting[oi]) {
        const c = op as CompactOp;
        c.condFromSum(s, this.sums[oi]! - c.weightAt(s, this.x[i]!), acc);
      } else op.cond(s, this.x, acc);
    }
  }

  set(i: number, v: number): void {
    const old = this.x[i]!;
    if (old === v) return;
    const ao = this.engine.adjOp[i]!, as = this.engine.adjSlot[i]!;
    for (let k = 0; k < ao.length; k++) {
      const oi = ao[k]!, s = as[k]!;
      if (this.counting[oi]) {
        const c = this.engine.ops[oi] as CompactOp;
        this.sums[oi]! += c.weightAt(s, v) - c.weightAt(s, old);
      }
    }
    this.hold(i, old, false);
    this.x[i] = v;
    this.hold(i, v, true);
  }

  /** Passes stop early once clock() passes this. */
  deadline = Infinity;
  /** Milliseconds clock for deadlines (wall clock unless the caller injects another, e.g. CPU time). */
  clock: () => number = Date.now;
  private late(step: number): boolean {
    return (step & 31) === 0 && this.clock() > this.deadline;
  }

  /** One pass of single-variable moves; returns the total gain. */
  icmPass(order: number[]): number {
    let gain = 0, step = 0;
    const acc = this.acc;
    for (const i of order) {
      if (this.late(++step)) break;
      if (this.fixed[i]) continue;
      const K = this.engine.card[i]!;
      this.local(i, acc);
      const cur = this.x[i]!;
      let best = cur;
      for (let v = 0; v < K; v++) if (acc[v]! > acc[best]! + EPS) best = v;
      if (best !== cur) {
        gain += acc[best]! - acc[cur]!;
        this.set(i, best);
      }
    }
    return gain;
  }

  /** One pass of key swaps / ejections; returns the total gain. */
  swapPass(order: number[], candidates = 3): number {
    let gain = 0, step = 0;
    const engine = this.engine, acc = this.acc, acc2 = this.acc2;
    for (const a of order) {
      if (this.late(++step)) break;
      if (this.fixed[a]) continue;
      const K = engine.card[a]!;
      this.local(a, acc);
      const cur = this.x[a]!;
      const base = acc[cur]!;
      const cands: number[] = [];
      for (let v = 0; v < K; v++) {
        if (v === cur || engine.keys.group[a]![v] === 0) continue;
        const hs = this.holders.get(engine.keys.group[a]![v]!);
        if (!hs || hs.size === 0) continue;
        cands.push(v);
      }
      cands.sort((p, q) => acc[q]! - acc[p]!);
      for (const v of cands.slice(0, candidates)) {
        const hs = this.holders.get(engine.keys.group[a]![v]!);
        if (!hs) continue;
        const b = hs.values().next().value as number | undefined;
        if (b === undefined || b === a || this.fixed[b]) continue;
        const da = acc[v]! - base;
        this.set(a, v);
        this.local(b, acc2);
        const xb = this.x[b]!;
        let vb = xb;
        for (let u = 0; u < engine.card[b]!; u++) if (acc2[u]! > acc2[vb]! + EPS) vb = u;
        const db = acc2[vb]! - acc2[xb]!;
        if (da + db > EPS) {
          this.set(b, vb);
          gain += da + db;
          break;
        }
        this.set(a, cur);
      }
    }
    return gain;
  }

  /**
   * Moves toward a target assignment (e.g. the decoded beliefs), one variable at a
   * time; a move that takes a key held elsewhere also re-optimizes that holder.
   * Kept when the exact change is ≥ 0 (plateau moves allowed), else undone.
   */
  guided(target: Int32Array, order: number[]): number {
    let gain = 0, step = 0;
    const engine = this.engine, acc = this.acc, acc2 = this.acc2;
    for (const a of order) {
      if (this.late(++step)) break;
      const v = target[a]!, cur = this.x[a]!;
      if (v === cur || this.fixed[a]) continue;
      this.local(a, acc);
      const da = acc[v]! - acc[cur]!;
      const g = engine.keys.group[a]![v]!;
      const hs = g !== 0 ? this.holders.get(g) : undefined;
      const b = hs && hs.size ? (hs.values().next().value as number) : -1;
      this.set(a, v);
      let db = 0;
      if (b >= 0 && b !== a && !this.fixed[b]) {
        this.local(b, acc2);
        const xb = this.x[b]!;
        let vb = xb;
        for (let u = 0; u < engine.card[b]!; u++) if (acc2[u]! > acc2[vb]! + EPS) vb = u;
        db = acc2[vb]! - acc2[xb]!;
        if (da + db >= -EPS) {
          this.set(b, vb);
          gain += da + db;
          continue;
        }
      } else if (da >= -EPS) {
        gain += da;
        continue;
      }
      this.set(a, cur);
    }
    return gain;
  }

  /** Moves and swaps until no gain or the deadline passes. Returns the big-M score. */
  run(deadline: number, maxRounds = 100): number {
    this.deadline = deadline;
    this.converged = false;
    const order = shuffle(Array.from({ length: this.engine.n }, (_, i) => i), this.random);
    for (let r = 0; r < maxRounds; r++) {
      let g = this.icmPass(order);
      if (this.clock() > deadline) break;
      if (g <= EPS) {
        g += this.swapPass(order);
        if (g <= EPS) {
          this.converged = !(this.clock() > deadline);
          break;
        }
        if (this.clock() > deadline) break;
      }
    }
    return engineScore(this.engine, this.x);
  }
  /** Whether the last run reached a local optimum (no improving move or swap) before its deadline. */
  converged = false;
}

/** Improve x in place with moves and swaps; returns the big-M score. */
export function improve(engine: Engine, x: Int32Array, seed: number, deadline: number, fixed?: Uint8Array): number {
  const ls = new LocalSearch(engine, x, rng(seed), fixed);
  const s = ls.run(deadline);
  x.set(ls.x);
  return s;
}
