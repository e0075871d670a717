/**
 * The part MPLP and loopy max-product share: starting incumbents, sweeps over the operators
 * (forward and backward in turn) with the algorithm's own update and bound, decoding of the
 * beliefs every few sweeps improved by local search, the stall test, the primal search that
 * spends what is left of the budget once the dual has stalled, and the result.
 */
import { AnytimeRun, safeStart, unaryStart, type RunSteps } from './anytime';
import { engineScore } from './engine';
import { LocalSearch, rng, shuffle } from './local-search';
import { TabuSearch, tabuApplies } from './tabu';
import { decodeBeliefs, newMessageState, type MessageState } from './message-state';
import type { StopReason } from './map-solver';
import type { LoopyOptions } from './options';

/** What a loopy algorithm plugs into the sweeps. */
export interface LoopyAlgorithm {
  /** Update operator oi's messages in place. */
  update(oi: number): void;
  /** Upper bound after a full sweep; Infinity when this sweep does not compute one. */
  bound(iteration: number): number;
  /**
   * Whether a stalled dual ends the sweeps at once (the caller has something better to do with
   * the time, e.g. branch and bound); otherwise only after `dualTimeFraction` of the budget.
   */
  stopAtStall: boolean;
  /** End the sweeps at this share of the budget even while the dual still moves (a primal search wants the rest); default 1. */
  sweepShare?: number;
}

/** Shared state of one loopy run: the anytime bookkeeping, the messages, the random stream. */
export interface LoopyRun {
  run: AnytimeRun;
  state: MessageState;
  random: () => number;
  /** Whether the incumbent's local search reached a local optimum. */
  incumbentConverged: boolean;
  /**
   * Whether the primal search is tabu search (tabu.ts): asked for (`tabuSearch`) and every
   * operator small enough (`tabuApplies`); otherwise randomized repairs (`repairRestarts`).
   */
  tabu: boolean;
}

/** A loopy run at its start: messages at zero and the starting incumbents offered (offerStarts). */
export function startLoopy(run: AnytimeRun, opt: LoopyOptions): LoopyRun {
  const loopy: LoopyRun = { run, state: newMessageState(run.engine), random: rng(opt.seed), incumbentConverged: true, tabu: opt.tabuSearch && tabuApplies(run.engine) };
  offerStarts(loopy, opt);
  run.progress();
  return loopy;
}

/**
 * Initial incumbents, each improved locally: the caller's start if given, each variable's best
 * value by its unary score (good when the unaries dominate), and a "safe" start where every
 * variable takes its best keyless value when it has one (a seat left open collides with
 * nothing). Local search never trades a feasible state for an infeasible one, so a feasible
 * start stays feasible.
 */
export function offerStarts(loopy: LoopyRun, opt: LoopyOptions): void {
  const { run, random } = loopy, engine = run.engine, now = run.now;
  const starts = [...(opt.initial ? [Int32Array.from(opt.initial)] : []), unaryStart(engine), safeStart(engine)];
  const budget = Math.max(30, (opt.timeLimitMs * 0.12) / starts.length);
  for (const [k, start] of starts.entries()) {
    // the caller's start is always scored, even with no time left: it may be all they have
    const callers = k === 0 && opt.initial !== undefined;
    if (now() > run.deadline && !callers) break;
    const ls = new LocalSearch(engine, start, random);
    ls.clock = now;
    const s = opt.localSearch && now() <= run.deadline ? ls.run(Math.min(run.deadline, now() + budget)) : engineScore(engine, ls.x);
    if (run.offer(ls.x, s)) loopy.incumbentConverged = ls.converged || !opt.localSearch;
  }
}

/**
 * Sweeps until the gap closes, the budget or the iterations run out, the signal aborts, or the
 * dual stalls (see LoopyAlgorithm.stopAtStall). Returns why it stopped.
 */
export function* sweeps(loopy: LoopyRun, algorithm: LoopyAlgorithm, opt: LoopyOptions, signal: AbortSignal | undefined): Generator<void, StopReason, void> {
  const { run, state, random } = loopy, engine = run.engine, now = run.now, deadline = run.deadline;
  const orderForward = Array.from(engine.ops.keys());
  const orderBackward = [...orderForward].reverse();
  let stopReason: StopReason = 'iterations';
  let lastBoundImprove = Infinity;
  let decodeMs = 0, decodes = 0;
  const shuffleOrder = (n: number): number[] => shuffle(Array.from({ length: n }, (_, i) => i), random);
  let sweepMs = 0;
  let opsSinceYield = 0;
  for (run.iterations = 1; run.iterations <= opt.maxIterations; run.iterations++) {
    const iterations = run.iterations;
    const order = iterations % 2 ? orderForward : orderBackward;
    const ts = now();
    let cut = false;
    for (const oi of order) {
      algorithm.update(oi);
      // check the clock every 64 operators, and after every large one
      opsSinceYield += engine.ops[oi]!.vars.length > 256 ? 64 : 1;
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
      const b = algorithm.bound(iterations);
      if (b < run.bound - Math.max(opt.stallTolerance, 1e-12 * Math.abs(run.bound))) {
        if (run.bound - b > opt.stallTolerance * Math.max(1, Math.abs(b))) lastBoundImprove = iterations;
        run.bound = b;
        run.record();
      } else if (b < run.bound) run.bound = b;
      if (lastBoundImprove === Infinity) lastBoundImprove = iterations;
    }
    // decode every few sweeps while decoding has used under 40 % of the time, and on the last sweep
    const sinceStart = run.elapsed();
    const stalledDual = iterations - lastBoundImprove >= opt.stallSweeps;
    // (slow sweeps: decode after each one, so large models still get their share of local search)
    const due = (iterations % opt.decodeEvery === 0 || sweepMs > 100) && decodeMs <= 0.4 * sinceStart;
    if ((cut || stalledDual || due || iterations === opt.maxIterations) && now() < deadline) {
      const td = now();
      const target = decodeBeliefs(state);
      let x: Int32Array, s: number;
      if (!opt.localSearch) {
        x = target;
        s = engineScore(engine, x);
      } else {
        // alternate: the incumbent moved toward the decoded beliefs (first), or the beliefs repaired from scratch;
        // an incumbent whose local search was cut short is first improved further as it is
        const fromIncumbent = run.bestX !== null && (decodes % 2 === 0 || !loopy.incumbentConverged);
        const ls = new LocalSearch(engine, fromIncumbent ? run.bestX! : target, random);
        ls.clock = now;
        const until = Math.min(deadline, now() + Math.max(20, Math.min(sweepMs * 3 + 50, (deadline - now()) * 0.25)));
        if (fromIncumbent && loopy.incumbentConverged) {
          ls.deadline = until;
          ls.guided(target, shuffleOrder(engine.n));
        }
        s = ls.run(until);
        x = ls.x;
        if (fromIncumbent || s > run.bestBig) loopy.incumbentConverged = ls.converged;
      }
      decodes++;
      run.offer(x, s);
      decodeMs += now() - td;
    }
    run.progress();
    if (run.gapClosed()) {
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
    if ((stalledDual && (algorithm.stopAtStall || run.elapsed() > opt.timeLimitMs * opt.dualTimeFraction)) || run.elapsed() > opt.timeLimitMs * (algorithm.sweepShare ?? 1)) {
      stopReason = 'stalled';
      break;
    }
    yield;
  }
  if (run.iterations > opt.maxIterations) run.iterations = opt.maxIterations;
  return stopReason;
}

/** The dual is stuck: spend what is left on randomized decodings of the beliefs, each improved by local search. */
export function* repairRestarts(loopy: LoopyRun, signal: AbortSignal | undefined): RunSteps {
  const { run, state, random } = loopy, engine = run.engine, now = run.now;
  while (now() < run.deadline && !signal?.aborted) {
    const x = decodeBeliefs(state);
    for (let i = 0; i < engine.n; i++) if (random() < 0.05) x[i] = Math.floor(random() * engine.card[i]!);
    const ls = new LocalSearch(engine, x, random);
    ls.clock = now;
    const s = ls.run(run.deadline);
    run.offer(ls.x, s);
    run.progress();
    yield;
  }
}

/**
 * Tabu search (tabu.ts) from the incumbent until `until` (or until `maxIdleRestarts` restarts in
 * a row found no new best), in slices of ~50 ms so the signal and the event loop get their turn;
 * each slice's best is offered to the run (which keeps it only when it beats the incumbent).
 */
export function* tabuPhase(loopy: LoopyRun, signal: AbortSignal | undefined, until: number, maxIdleRestarts = Infinity, tabu = newTabu(loopy)): RunSteps {
  const run = loopy.run, now = run.now;
  // a search carried over from an earlier phase counts its idle restarts afresh
  tabu.idleRestarts = 0;
  while (now() < until && !signal?.aborted && !run.gapClosed() && tabu.idleRestarts < maxIdleRestarts) {
    const sliceEnd = Math.min(until, now() + 50);
    tabu.run(() => now() >= sliceEnd || signal?.aborted === true || tabu.idleRestarts >= maxIdleRestarts);
    run.offer(tabu.best, tabu.bestScore);
    run.progress();
    yield;
  }
}

/** Tabu search from the incumbent (the decoded beliefs while there is none). */
export function newTabu(loopy: LoopyRun): TabuSearch {
  return new TabuSearch(loopy.run.engine, loopy.run.bestX ?? decodeBeliefs(loopy.state), loopy.random);
}

/** Whether a search after the sweeps has anything to do: the gap open, time left, no abort. */
export function searchLeft(loopy: LoopyRun, signal: AbortSignal | undefined): boolean {
  const run = loopy.run;
  return !run.gapClosed() && run.now() < run.deadline && !signal?.aborted;
}

/**
 * The primal search on a stalled dual when no exact method follows: tabu search (loopy.tabu) or
 * randomized repairs, until the deadline. Returns the run's stop reason.
 */
export function* primalSearch(loopy: LoopyRun, signal: AbortSignal | undefined): Generator<void, StopReason, void> {
  if (loopy.tabu) yield* tabuPhase(loopy, signal, loopy.run.deadline);
  else yield* repairRestarts(loopy, signal);
  return signal?.aborted ? 'aborted' : 'time';
}

/** The result of a loopy run that proved nothing by itself: a finite bound, 'gap' once it closed. */
export function finishLoopy(loopy: LoopyRun, method: string, stopReason: StopReason): void {
  const run = loopy.run;
  ensureBound(run);
  run.finish(method, run.gapClosed() ? 'gap' : stopReason, false, loopy.state.belief);
}

/** No sweep finished in time: the sum of each part's own maximum is always a valid bound. */
export function ensureBound(run: AnytimeRun): void {
  if (run.bound !== Infinity) return;
  const engine = run.engine;
  let bound = engine.constant;
  for (const t of engine.theta) bound += Math.max(...t);
  for (const op of engine.ops) bound += op.upper();
  run.bound = bound;
}
