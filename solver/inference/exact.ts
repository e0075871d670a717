/**
 * Exact methods: exhaustive enumeration for tiny models and two-pass max-product /
 * sum-product on forests, and the two MapSolvers built on them.
 */
import type { Model } from '../model/types';
import { anytimeSolver, type AnytimeRun } from './anytime';
import { NEG, lseArray } from './factor-operators';
import { buildEngine, engineScore, isForest, type Engine } from './engine';
import type { MapSolver } from './map-solver';
import { OperatorBuffers, gatherIncoming, newMessageState, productUpdate, type MessageState } from './message-state';
import { DEFAULT_BASE_OPTIONS, DEFAULT_ENUMERATION_OPTIONS, type EnumerationOptions, type TreeOptions } from './options';
import { betheLogZ } from './sum-product';

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
  const engine = buildEngine(model, { hardPenalty: Infinity });
  const n = engine.n;
  let states = 1;
  for (let i = 0; i < n; i++) states *= engine.card[i]!;
  if (states > maxStates) throw new Error(`enumeration: ${states} states exceeds the limit ${maxStates}`);
  const x = new Int32Array(n);
  const mm = Array.from(engine.card, (k) => new Float64Array(k).fill(NEG));
  let best = NEG, bestX = Array.from(x);
  const scores = new Float64Array(states);
  for (let e = 0; e < states; e++) {
    const s = engineScore(engine, x);
    scores[e] = s;
    if (s > best) {
      best = s;
      bestX = Array.from(x);
    }
    for (let i = 0; i < n; i++) if (s > mm[i]![x[i]!]!) mm[i]![x[i]!] = s;
    for (let i = n - 1; i >= 0; i--) {
      if (++x[i]! < engine.card[i]!) break;
      x[i] = 0;
    }
  }
  const logZ = lseArray(scores);
  const marg = Array.from(engine.card, (k) => new Float64Array(k));
  if (logZ !== NEG) {
    x.fill(0);
    for (let e = 0; e < states; e++) {
      const p = Math.exp(scores[e]! - logZ);
      for (let i = 0; i < n; i++) marg[i]![x[i]!]! += p;
      for (let i = n - 1; i >= 0; i--) {
        if (++x[i]! < engine.card[i]!) break;
        x[i] = 0;
      }
    }
  }
  return { assignment: bestX, score: best, maxMarginals: mm, logZ, marginals: marg, states };
}

/** Operator order for a forest: breadth-first from each component's first variable (downward order). */
export function forestOrder(engine: Engine): { order: number[]; parentVar: Int32Array; roots: number[] } {
  const seenVar = new Uint8Array(engine.n), seenOp = new Uint8Array(engine.ops.length);
  const parentVar = new Int32Array(engine.ops.length).fill(-1);
  const order: number[] = [];
  const roots: number[] = [];
  for (let r = 0; r < engine.n; r++) {
    if (seenVar[r]) continue;
    roots.push(r);
    seenVar[r] = 1;
    const queue = [r];
    for (let q = 0; q < queue.length; q++) {
      const v = queue[q]!;
      for (const oi of engine.adjOp[v]!) {
        if (seenOp[oi]) continue;
        seenOp[oi] = 1;
        parentVar[oi] = v;
        order.push(oi);
        for (const u of engine.ops[oi]!.vars) {
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

/** Two sequential passes (leaves → roots, roots → leaves) of max- or sum-product on a forest. */
export function forestPasses(engine: Engine, sum: boolean): { state: MessageState; parentVar: Int32Array; order: number[]; roots: number[] } {
  const { order, parentVar, roots } = forestOrder(engine);
  const state = newMessageState(engine);
  const buf = new OperatorBuffers();
  for (let k = order.length - 1; k >= 0; k--) productUpdate(engine, state, order[k]!, buf, sum, 0);
  for (const oi of order) productUpdate(engine, state, oi, buf, sum, 0);
  return { state, parentVar, order, roots };
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
export function exactTreeMap(engine: Engine): { x: Int32Array; maxMarginals: Float64Array[]; best: number } {
  if (!isForest(engine)) throw new Error('exactTreeMap: the factor graph has a cycle');
  const { state, parentVar, order, roots } = forestPasses(engine, false);
  const x = new Int32Array(engine.n).fill(-1);
  for (const r of roots) x[r] = argmax(state.belief[r]!);
  const buf = new OperatorBuffers();
  const clamp = (oi: number, s: number, v: number): void => {
    const op = engine.ops[oi]!, inc = buf.inc, sup = op.sup;
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
    const op = engine.ops[oi]!;
    gatherIncoming(engine, state, oi, buf, false);
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
          const b = state.belief[j]!;
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
  const best = engineScore(engine, x);
  const maxMarginals = state.belief.map((b) => {
    let m = NEG;
    for (const v of b) if (v > m) m = v;
    return b.map((v) => v - m + best);
  });
  return { x, maxMarginals, best };
}

/** Exact log Z and marginals on a forest by two sum-product passes (Bethe is exact on forests). */
export function exactTreeMarginals(engine: Engine): { logZ: number; marginals: Float64Array[] } {
  const { state } = forestPasses(engine, true);
  const logZ = betheLogZ(engine, state, new OperatorBuffers());
  return { logZ, marginals: beliefsToMarginals(state.belief) };
}

export function beliefsToMarginals(belief: Float64Array[]): Float64Array[] {
  return belief.map((b) => {
    const z = lseArray(b);
    return b.map((v) => (z === NEG ? 1 / b.length : Math.exp(v - z)));
  });
}

/** Exhaustive enumeration as a MapSolver: exact, for models of at most `maxStates` joint assignments. */
export const enumerationSolver: MapSolver<EnumerationOptions> = anytimeSolver('enumerate', DEFAULT_ENUMERATION_OPTIONS, function* (run, opt) {
  enumerationSteps(run, opt.maxStates);
});

/** Enumeration inside a run (the dispatcher's first choice on tiny models). */
export function enumerationSteps(run: AnytimeRun, maxStates: number): void {
  const r = enumerateModel(run.model, maxStates);
  run.bestX = Int32Array.from(r.assignment);
  run.bound = r.score;
  run.iterations = r.states;
  run.timeToBest = run.elapsed();
  run.finish('enumerate', 'optimal', true);
}

/** Two-pass max-product with clamped decoding as a MapSolver: exact on forest-shaped factor graphs (throws on a cycle). */
export const treeSolver: MapSolver<TreeOptions> = anytimeSolver('tree', DEFAULT_BASE_OPTIONS, function* (run) {
  treeSteps(run);
});

/** The tree pass inside a run. */
export function treeSteps(run: AnytimeRun): void {
  const r = exactTreeMap(run.engine);
  run.bestX = r.x;
  run.bound = r.best;
  run.iterations = 2;
  run.timeToBest = run.elapsed();
  // a forest's bound is exact for the big-M model; if that optimum breaks a hard factor, none is feasible
  run.finish('tree', 'optimal', true, r.maxMarginals);
}
