/**
 * The MAP entry point: anytime, seeded, cancellable.
 *
 * method 'auto':
 *   1. tiny state space → exhaustive enumeration (exact);
 *   2. forest-shaped factor graph → two-pass max-product with clamped decoding (exact);
 *   3. otherwise MPLP sweeps (alternating forward / backward operator order), each
 *      giving the dual upper bound; every few sweeps the beliefs are decoded and
 *      improved by local search; when the bound stalls on a small model, branch
 *      and bound on the reparametrized model closes the gap.
 * method 'maxProduct' runs damped loopy max-product instead of MPLP; its bound is
 * the dual value of its messages read as a reparametrization (valid, usually looser).
 *
 * Result scores are exact model scores (-Infinity when no feasible assignment was
 * found). gap = (bound - score) / max(1, |score|).
 */
import type { Model } from '../model/types';
import { score as exactScore } from '../model/score';
import { OpBuffers, buildEngine, decodeBeliefs, engineScore, isForest, log10States, newMessageState, type Engine, type MessageState } from './engine';
import { enumerateModel, exactTreeMap } from './exact';
import { LocalSearch, rng, shuffle } from './local-search';
import { generalDualBound, mplpBound, mplpUpdate, productUpdate } from './message-passing';
import { branchAndBound } from './branch-bound';
import { resolveMapOptions, type MapOptions, type Progress } from './options';

export interface HistoryPoint {
  iteration: number;
  timeMs: number;
  score: number;
  bound: number;
}

export type StopReason = 'optimal' | 'gap' | 'time' | 'iterations' | 'aborted' | 'stalled' | 'infeasible';

export interface MapResult {
  assignment: number[];
  /** Exact model score of the assignment (-Infinity if it breaks a hard factor). */
  score: number;
  /** Upper bound on the best score of any assignment. */
  bound: number;
  /** (bound - score) / max(1, |score|); 0 when proven optimal, Infinity when nothing feasible was found. */
  gap: number;
  feasible: boolean;
  /** True when the assignment is proven optimal (enumeration, tree, closed gap or complete branch and bound). */
  optimal: boolean;
  method: string;
  iterations: number;
  timeMs: number;
  /** Time at which the returned assignment was found. */
  timeToBestMs: number;
  stopReason: StopReason;
  history: HistoryPoint[];
  /** Beliefs of the final message state (for explanations); null for enumeration. */
  beliefs?: Float64Array[] | null;
}

export function relativeGap(score: number, bound: number): number {
  if (score === -Infinity) return bound === -Infinity ? 0 : Infinity;
  const g = (bound - score) / Math.max(1, Math.abs(score));
  return g < 0 ? 0 : g;
}

/** Beliefs of a fresh message state are the unary scores. */
function st0(E: Engine): MessageState {
  return { belief: E.theta, msg: [], opConst: new Float64Array(0), tops: null as never };
}

/** Per variable: the best keyless value by its unary score if there is one, else the best value. */
function safeStart(E: Engine): Int32Array {
  return Int32Array.from(E.theta, (t, i) => {
    const g = E.keys.group[i]!;
    let best = -1, any = 0;
    for (let x = 0; x < t.length; x++) {
      if (t[x]! > t[any]!) any = x;
      if (g[x] === 0 && (best < 0 || t[x]! > t[best]!)) best = x;
    }
    return best >= 0 && t[best]! > -E.H / 2 ? best : any;
  });
}

/** Internal: a solve as a generator that yields whenever the caller may pause (async) or check the signal. */
function* solveSteps(model: Model, opt: MapOptions, signal: AbortSignal | undefined, out: { result?: MapResult }): Generator<void, void, void> {
  const now = opt.clock ?? Date.now;
  const t0 = now();
  const deadline = t0 + opt.timeLimitMs;
  const E = buildEngine(model, { hardPenalty: opt.hardPenalty });
  const history: HistoryPoint[] = [];
  let iterations = 0;
  let bestX: Int32Array | null = null;
  let bestBig = -Infinity;
  let bound = Infinity;
  let timeToBest = 0;
  let lastProgress = 0;
  const R = rng(opt.seed);
  const elapsed = (): number => now() - t0;
  // exact score of the incumbent, recomputed only when the incumbent changes
  let cachedFor: Int32Array | null = null, cachedScore = -Infinity;
  const trueScore = (x: Int32Array): number => {
    if (x !== cachedFor) {
      cachedFor = x;
      cachedScore = exactScore(model, x);
    }
    return cachedScore;
  };

  const record = (): void => {
    const s = bestX ? trueScore(bestX) : -Infinity;
    const p: HistoryPoint = { iteration: iterations, timeMs: elapsed(), score: s, bound };
    const last = history[history.length - 1];
    if (!last || last.score !== p.score || last.bound !== p.bound) history.push(p);
    if (history.length > 2000) history.splice(1, history.length - 1000); // keep first and recent points
  };
  const progress = (force = false): void => {
    if (!opt.onProgress) return;
    const now = elapsed();
    if (!force && now - lastProgress < opt.progressEveryMs) return;
    lastProgress = now;
    const s = bestX ? trueScore(bestX) : -Infinity;
    const pr: Progress = { iteration: iterations, timeMs: now, score: s, bound, gap: relativeGap(s, bound) };
    opt.onProgress(pr);
  };
  const offer = (x: Int32Array, big?: number): boolean => {
    const s = big ?? engineScore(E, x);
    if (s > bestBig + 1e-9 || bestX === null) {
      bestBig = s;
      bestX = Int32Array.from(x);
      timeToBest = elapsed();
      record();
      return true;
    }
    return false;
  };
  const finish = (method: string, stopReason: StopReason, optimal: boolean, beliefs: Float64Array[] | null = null): void => {
    if (!optimal && (bestX === null || trueScore(bestX) === -Infinity)) {
      // out of time while infeasible: the keyless start, unimproved, may still be feasible
      const safe = safeStart(E);
      if (exactScore(model, safe) > -Infinity) {
        bestX = safe;
        bestBig = engineScore(E, safe);
        timeToBest = elapsed();
      }
    }
    const x = bestX ?? new Int32Array(E.n);
    const s = trueScore(x);
    let b = bound;
    if (optimal) b = s;
    // rounding noise of the dual may leave the bound a hair under the score
    if (b < s && s - b <= 1e-6 * Math.max(1, Math.abs(s))) b = s;
    if (optimal && s === -Infinity) stopReason = 'infeasible';
    const gap = relativeGap(s, b);
    record();
    out.result = {
      assignment: Array.from(x),
      score: s,
      bound: b,
      gap,
      feasible: s > -Infinity,
      optimal: optimal || (s > -Infinity && b - s <= opt.absoluteTolerance),
      method,
      iterations,
      timeMs: elapsed(),
      timeToBestMs: timeToBest,
      stopReason,
      history,
      beliefs,
    };
    progress(true);
  };
  const gapClosed = (): boolean => {
    if (!bestX) return false;
    const s = trueScore(bestX);
    if (s === -Infinity) return false;
    return bound - s <= opt.absoluteTolerance || relativeGap(s, bound) <= opt.relativeGap;
  };

  if (signal?.aborted) {
    finish('none', 'aborted', false);
    return;
  }
  if (E.n === 0) {
    bestX = new Int32Array(0);
    bound = E.constant;
    finish('enumerate', 'optimal', true);
    return;
  }
  const method = opt.method;
  const tiny = log10States(E) <= Math.log10(Math.max(1, opt.enumerationLimit));
  if (method === 'enumerate' || (method === 'auto' && tiny)) {
    const r = enumerateModel(model, method === 'enumerate' ? Number.MAX_SAFE_INTEGER : opt.enumerationLimit);
    bestX = Int32Array.from(r.assignment);
    bound = r.score;
    iterations = r.states;
    timeToBest = elapsed();
    finish('enumerate', 'optimal', true);
    return;
  }
  if (method === 'tree' || (method === 'auto' && isForest(E))) {
    const r = exactTreeMap(E);
    bestX = r.x;
    bound = r.best;
    iterations = 2;
    timeToBest = elapsed();
    // a forest's bound is exact for the big-M model; if that optimum breaks a hard factor, none is feasible
    finish('tree', 'optimal', true, r.maxMarginals);
    return;
  }

  // ---- loopy: MPLP (or damped max-product) with decoding and local search
  const useMplp = method !== 'maxProduct';
  const st: MessageState = newMessageState(E);
  const buf = new OpBuffers();
  const orderF = Array.from(E.ops.keys());
  const orderB = [...orderF].reverse();

  let incumbentConverged = true;
  // initial incumbents, each improved locally: the caller's start if given, each variable's best
  // value by its unary score (good when the unaries dominate), and a "safe" start where every
  // variable takes its best keyless value when it has one (a seat left open collides with
  // nothing). Local search never trades a feasible state for an infeasible one, so a feasible
  // start stays feasible.
  {
    const starts = [...(opt.initial ? [Int32Array.from(opt.initial)] : []), decodeBeliefs(st0(E)), safeStart(E)];
    const budget = Math.max(30, (opt.timeLimitMs * 0.12) / starts.length);
    for (const [k, start] of starts.entries()) {
      // the caller's start is always scored, even with no time left: it may be all they have
      const callers = k === 0 && opt.initial !== undefined;
      if (now() > deadline && !callers) break;
      const ls = new LocalSearch(E, start, R);
      ls.clock = now;
      const s = opt.localSearch && now() <= deadline ? ls.run(Math.min(deadline, now() + budget)) : engineScore(E, ls.x);
      if (offer(ls.x, s)) incumbentConverged = ls.converged || !opt.localSearch;
    }
  }
  progress();
  yield;

  let stopReason: StopReason = 'iterations';
  let lastBoundImprove = Infinity;
  let decodeMs = 0, decodes = 0;
  const shuffleOrder = (n: number): number[] => shuffle(Array.from({ length: n }, (_, i) => i), R);
  let sweepMs = 0;
  const bbAllowed = useMplp && E.n <= opt.branchAndBoundMaxVars;
  let opsSinceYield = 0;
  for (iterations = 1; iterations <= opt.maxIterations; iterations++) {
    const order = iterations % 2 ? orderF : orderB;
    const ts = now();
    let cut = false;
    for (const oi of order) {
      if (useMplp) mplpUpdate(E, st, oi, buf);
      else productUpdate(E, st, oi, buf, false, opt.damping);
      // check the clock every 64 operators, and after every large one
      opsSinceYield += E.ops[oi]!.vars.length > 256 ? 64 : 1;
      if (opsSinceYield >= 64) {
        opsSinceYield = 0;
        if (now() > deadline || signal?.aborted) {
          cut = true;
          break;
        }
      }
    }
    sweepMs = now() - ts;
    if (!cut) {
      const b = useMplp ? mplpBound(E, st) : iterations % opt.decodeEvery === 0 ? generalDualBound(E, st, buf) : Infinity;
      if (b < bound - Math.max(opt.stallTolerance, 1e-12 * Math.abs(bound))) {
        if (bound - b > opt.stallTolerance * Math.max(1, Math.abs(b))) lastBoundImprove = iterations;
        bound = b;
        record();
      } else if (b < bound) bound = b;
      if (lastBoundImprove === Infinity) lastBoundImprove = iterations;
    }
    // decode every few sweeps while decoding has used under 40 % of the time, and on the last sweep
    const sinceStart = elapsed();
    const stalledDual = iterations - lastBoundImprove >= opt.stallSweeps;
    // (slow sweeps: decode after each one, so large models still get their share of local search)
    const due = (iterations % opt.decodeEvery === 0 || sweepMs > 100) && decodeMs <= 0.4 * sinceStart;
    if ((cut || stalledDual || due || iterations === opt.maxIterations) && now() < deadline) {
      const td = now();
      const target = decodeBeliefs(st);
      let x: Int32Array, s: number;
      if (!opt.localSearch) {
        x = target;
        s = engineScore(E, x);
      } else {
        // alternate: the incumbent moved toward the decoded beliefs (first), or the beliefs repaired from scratch
        // an incumbent whose local search was cut short is first improved further as it is
        const fromIncumbent = bestX !== null && (decodes % 2 === 0 || !incumbentConverged);
        const ls = new LocalSearch(E, fromIncumbent ? bestX! : target, R);
        ls.clock = now;
        const until = Math.min(deadline, now() + Math.max(20, Math.min(sweepMs * 3 + 50, (deadline - now()) * 0.25)));
        if (fromIncumbent && incumbentConverged) {
          ls.deadline = until;
          ls.guided(target, shuffleOrder(E.n));
        }
        s = ls.run(until);
        x = ls.x;
        if (fromIncumbent || s > bestBig) incumbentConverged = ls.converged;
      }
      decodes++;
      offer(x, s);
      decodeMs += now() - td;
    }
    progress();
    if (gapClosed()) {
      stopReason = 'gap';
      break;
    }
    if (signal?.aborted) {
      stopReason = 'aborted';
      break;
    }
    if (now() > deadline) {
      stopReason = 'time';
      break;
    }
    if (stalledDual && (bbAllowed || elapsed() > opt.timeLimitMs * opt.dualTimeFraction)) {
      stopReason = 'stalled';
      break;
    }
    yield;
  }
  if (iterations > opt.maxIterations) iterations = opt.maxIterations;

  if (bbAllowed && !gapClosed() && stopReason !== 'aborted' && now() < deadline) {
    const r = branchAndBound(E, st, bestX, bestBig, deadline, signal, 1e-7, now);
    if (r.x) offer(r.x, r.best);
    if (r.complete) {
      bound = Math.min(bound, Math.max(bestBig, r.best));
      finish('mplp+bb', 'optimal', true, st.belief);
      return;
    }
    stopReason = signal?.aborted ? 'aborted' : 'time';
  } else if (stopReason === 'stalled' && !gapClosed() && now() < deadline && !signal?.aborted) {
    // the dual is stuck: spend what is left on randomized decodings and local search
    while (now() < deadline && !signal?.aborted) {
      const x = decodeBeliefs(st);
      for (let i = 0; i < E.n; i++) if (R() < 0.05) x[i] = Math.floor(R() * E.card[i]!);
      const ls = new LocalSearch(E, x, R);
      ls.clock = now;
      const s = ls.run(deadline);
      offer(ls.x, s);
      progress();
      yield;
    }
    stopReason = signal?.aborted ? 'aborted' : 'time';
  }
  // no sweep finished in time: fall back to the sum of each part's own maximum (always valid)
  if (bound === Infinity) {
    bound = E.constant;
    for (const t of E.theta) bound += Math.max(...t);
    for (const op of E.ops) bound += op.upper();
  }
  finish(useMplp ? 'mplp' : 'maxProduct', gapClosed() ? 'gap' : stopReason, false, st.belief);
}

/**
 * Solve for the MAP assignment synchronously. The signal is checked between
 * sweeps (it can be aborted from onProgress or another thread).
 */
export function solveMapSync(model: Model, options?: Partial<MapOptions>, signal?: AbortSignal): MapResult {
  const opt = resolveMapOptions(options);
  const out: { result?: MapResult } = {};
  const g = solveSteps(model, opt, signal, out);
  while (!g.next().done) {
    /* run to completion */
  }
  return out.result!;
}

/** Lets the event loop run (an abort, a progress write) between slices of work; setTimeout where setImmediate is missing (a browser). */
export const tick: () => Promise<void> =
  typeof setImmediate === 'function' ? () => new Promise((r) => setImmediate(r)) : () => new Promise((r) => setTimeout(r, 0));

/**
 * Solve for the MAP assignment, yielding to the event loop between sweeps so an
 * AbortSignal from elsewhere in the process can stop it. Resolves (never rejects
 * on abort) with the best assignment so far.
 */
export async function solveMap(model: Model, options?: Partial<MapOptions>, signal?: AbortSignal): Promise<MapResult> {
  const opt = resolveMapOptions(options);
  const out: { result?: MapResult } = {};
  const g = solveSteps(model, opt, signal, out);
  let last = Date.now();
  while (!g.next().done) {
    if (Date.now() - last > 20) {
      await tick();
      last = Date.now();
    }
  }
  return out.result!;
}

export type { Engine };
