/**
 * Exact methods: exhaustive enumeration for tiny models and two-pass
 * max-product / sum-product on forests.
 */
import type { Model } from '../model/types';
import { NEG, lseArray } from './ops';
import { OpBuffers, buildEngine, engineScore, gatherIncoming, isForest, newMessageState, type Engine, type MessageState } from './engine';
import { betheLogZ, forestOrder, productUpdate } from './message-passing';

export interface EnumerationResult {
  /** First assignment (in odometer order, last variable fastest) with the highest score. */
  assignment: number[];
  score: number;
  /** maxMarginals[i][x] = best score with x_i = x (-Infinity if impossible). */
  maxMarginals: Float64Array[];
  logZ: number;
  /** marginals[i][x] = P(x_i = x) under p(x) ∝ exp(score(x)). */
  marginals: Float64Array[];
  states: number;
}

/**
 * Exhaustive enumeration: visits all Π_i K_i assignments. Exact MAP, max-marginals,
 * log Z and marginals. Precondition: the state space is small (caller checks).
 */
export function enumerateModel(model: Model, maxStates = 5_000_000): EnumerationResult {
  const E = buildEngine(model, { hardPenalty: Infinity });
  const n = E.n;
  let states = 1;
  for (let i = 0; i < n; i++) states *= E.card[i]!;
  if (states > maxStates) throw new Error(`enumeration: ${states} states exceeds the limit ${maxStates}`);
  const x = new Int32Array(n);
  const mm = Array.from(E.card, (k) => new Float64Array(k).fill(NEG));
  let best = NEG, bestX = Array.from(x);
  const scores = new Float64Array(states);
  for (let e = 0; e < states; e++) {
    const s = engineScore(E, x);
    scores[e] = s;
    if (s > best) {
      best = s;
      bestX = Array.from(x);
    }
    for (let i = 0; i < n; i++) if (s > mm[i]![x[i]!]!) mm[i]![x[i]!] = s;
    for (let i = n - 1; i >= 0; i--) {
      if (++x[i]! < E.card[i]!) break;
      x[i] = 0;
    }
  }
  const logZ = lseArray(scores);
  const marg = Array.from(E.card, (k) => new Float64Array(k));
  if (logZ !== NEG) {
    x.fill(0);
    for (let e = 0; e < states; e++) {
      const p = Math.exp(scores[e]! - logZ);
      for (let i = 0; i < n; i++) marg[i]![x[i]!]! += p;
      for (let i = n - 1; i >= 0; i--) {
        if (++x[i]! < E.card[i]!) break;
        x[i] = 0;
      }
    }
  }
  return { assignment: bestX, score: best, maxMarginals: mm, logZ, marginals: marg, states };
}

/** Two sequential passes (leaves → roots, roots → leaves) of max- or sum-product on a forest. */
export function forestPasses(E: Engine, sum: boolean): { st: MessageState; parentVar: Int32Array; order: number[]; roots: number[] } {
  const { order, parentVar, roots } = forestOrder(E);
  const st = newMessageState(E);
  const buf = new OpBuffers();
  for (let k = order.length - 1; k >= 0; k--) productUpdate(E, st, order[k]!, buf, sum, 0);
  for (const oi of order) productUpdate(E, st, oi, buf, sum, 0);
  return { st, parentVar, order, roots };
}

function argmax(v: ArrayLike<number>): number {
  let b = 0;
  for (let x = 1; x < v.length; x++) if (v[x]! > v[b]!) b = x;
  return b;
}

/**
 * Exact MAP on a forest-shaped factor graph: max-product leaves→root and
 * root→leaves, then decoding downward with every decided variable clamped, so
 * ties cannot produce an inconsistent assignment.
 * Returns the assignment and exact max-marginals (big-M scores).
 */
export function exactTreeMap(E: Engine): { x: Int32Array; maxMarginals: Float64Array[]; best: number } {
  if (!isForest(E)) throw new Error('exactTreeMap: the factor graph has a cycle');
  const { st, parentVar, order, roots } = forestPasses(E, false);
  const x = new Int32Array(E.n).fill(-1);
  for (const r of roots) x[r] = argmax(st.belief[r]!);
  const buf = new OpBuffers();
  const clamp = (oi: number, s: number, v: number): void => {
    const op = E.ops[oi]!, inc = buf.inc, sup = op.sup;
    const o = op.off[s]!, e = op.off[s + 1]!;
    inc.fill(NEG, o, e);
    if (!sup) inc[o + v] = 0;
    else {
      let hit = false;
      for (let k = o; k < e; k++) if (sup[k] === v) (inc[k] = 0), (hit = true);
      buf.incRest[s] = hit ? NEG : 0;
    }
  };
  for (const oi of order) {
    const op = E.ops[oi]!;
    gatherIncoming(E, st, oi, buf, false);
    const p = parentVar[oi]!;
    const ps = op.vars.indexOf(p);
    clamp(oi, ps, x[p]!);
    for (let s = 0; s < op.vars.length; s++) {
      if (s === ps) continue;
      const j = op.vars[s]!;
      op.message('max', buf.inc, buf.incRest, buf.out, buf.outRest);
      const inc = buf.inc, out = buf.out, sup = op.sup, o = op.off[s]!, e = op.off[s + 1]!;
      let bestV = -1, bestS = NEG;
      if (!sup) {
        for (let k = o; k < e; k++) if (inc[k]! + out[k]! > bestS) (bestS = inc[k]! + out[k]!), (bestV = k - o);
      } else {
        for (let k = o; k < e; k++) if (inc[k]! + out[k]! > bestS) (bestS = inc[k]! + out[k]!), (bestV = sup[k]!);
        if (op.restCount![s]! > 0 && buf.incRest[s]! + buf.outRest[s]! > bestS) {
          // best state outside the support, by its own subtree belief
          const b = st.belief[j]!;
          let u = -1;
          for (let v = 0, k = o; v < b.length; v++) {
            if (k < e && sup[k] === v) {
              k++;
              continue;
            }
            if (u < 0 || b[v]! > b[u]!) u = v;
          }
          bestV = u;
        }
      }
      x[j] = bestV < 0 ? 0 : bestV;
      clamp(oi, s, x[j]!);
    }
  }
  const best = engineScore(E, x);
  const maxMarginals = st.belief.map((b) => {
    let m = NEG;
    for (const v of b) if (v > m) m = v;
    return b.map((v) => v - m + best);
  });
  return { x, maxMarginals, best };
}

/** Exact log Z and marginals on a forest by two sum-product passes (Bethe is exact on forests). */
export function exactTreeMarginals(E: Engine): { logZ: number; marginals: Float64Array[] } {
  const { st } = forestPasses(E, true);
  const logZ = betheLogZ(E, st, new OpBuffers());
  return { logZ, marginals: beliefsToMarginals(st.belief) };
}

export function beliefsToMarginals(belief: Float64Array[]): Float64Array[] {
  return belief.map((b) => {
    const z = lseArray(b);
    return b.map((v) => (z === NEG ? 1 / b.length : Math.exp(v - z)));
  });
}
