/**
 * MPLP (Globerson & Jaakkola 2007, star updates generalised to factors): block-coordinate
 * descent on the dual of the local-polytope LP, monotone, so every sweep gives a proven upper
 * bound. The beliefs are decoded every few sweeps and improved by local search; once the dual
 * stalls, small models get branch and bound on the reparametrised model (exact when it
 * finishes), others the primal search of loopy.ts.
 */
import { AnytimeRun, anytimeSolver, type RunSteps } from './anytime';
import { branchAndBound } from './branch-bound';
import type { Engine } from './engine';
import { finishLoopy, newTabu, primalSearch, searchLeft, startLoopy, sweeps, tabuPhase } from './loopy';
import type { MapSolver } from './map-solver';
import { OperatorBuffers, beliefMaxSum, gatherIncoming, setSlot, type MessageState } from './message-state';
import { DEFAULT_MPLP_OPTIONS, type MplpOptions } from './options';

/**
 * One MPLP star update of operator c (Globerson & Jaakkola 2007, generalized to
 * factors). With λ_i = b_i - δ_{c→i} and M_i(x_i) = max_{x_c\i} [θ_c + Σ_j λ_j]:
 *
 *   δ_{c→i}(x_i) ← M_i(x_i)/|c| - λ_i(x_i)
 *
 * which minimizes the dual U(δ) = Σ_i max b_i + Σ_c max_{x_c} [θ_c - Σ_i δ_{c→i}]
 * over the block δ_{c→·}; after it the factor term is 0. Compact slots use the
 * same update on state classes (support states, one class for the rest) and keep
 * the rest-class value in opConst[c], so U = Σ_i max b_i + Σ_c opConst[c] + const.
 * Precondition: all scores finite (big-M applied by buildEngine).
 */
export function mplpUpdate(engine: Engine, state: MessageState, oi: number, buf: OperatorBuffers): void {
  const op = engine.ops[oi]!;
  gatherIncoming(engine, state, oi, buf, false);
  const inc = buf.inc, out = buf.out, off = op.off;
  op.message('max', inc, buf.incRest, out, buf.outRest);
  const n = op.vars.length;
  let cst = 0;
  for (let s = 0; s < n; s++) {
    let restD = 0;
    if (op.sup && op.restCount![s]! > 0) {
      const ir = buf.incRest[s]!;
      restD = (buf.outRest[s]! + ir) / n - ir;
      cst += restD;
    }
    for (let k = off[s]!; k < off[s + 1]!; k++) out[k] = (out[k]! + inc[k]!) / n - inc[k]! - restD;
    setSlot(engine, state, oi, s, out);
  }
  state.opConst[oi] = cst;
}

/** Dual bound U(δ) of an MPLP state (valid once every operator has been updated). */
export function mplpBound(engine: Engine, state: MessageState): number {
  let u = beliefMaxSum(engine, state);
  for (let c = 0; c < state.opConst.length; c++) u += state.opConst[c]!;
  return u;
}

/**
 * Where tabu search applies, the sweeps end at this share of the budget even while the bound
 * still creeps down: on ±J spin glasses the local-polytope bound stays far from the optimum
 * (300 against 219 on a 150-spin torus) and the time is worth more to the primal search.
 */
const SWEEP_SHARE_BEFORE_TABU = 0.35;

/** Share of the time left after the sweeps that tabu search gets at most before branch and bound's first turn. */
const TABU_SHARE_BEFORE_BRANCHING = 0.5;

/** Tabu restarts in a row without a new best after which branch and bound gets its first turn. */
const IDLE_RESTARTS_BEFORE_BRANCHING = 5;

/** Idle restarts that end tabu's later turns early (doubled each turn): found by measurement, tabu often needs ~30 idle restarts on a 100-spin torus before its next best. */
const IDLE_RESTARTS_PER_TURN = 64;

/**
 * Share of the budget of branch and bound's first turn. When it does not finish, tabu search and
 * branch and bound take turns of doubling length (tabu's turn also ends after its idle restarts,
 * doubled each turn, once it stops finding anything): a model branch and bound closes in
 * milliseconds is proven at once, and one whose local-polytope bound is too weak for branch and
 * bound to finish (±J spin glasses of 100 spins and more: bound 200 against an optimum of 147)
 * still gets about half the budget for tabu search, where a single branch-and-bound run kept it
 * all. Each turn of branch and bound starts over; the doubling keeps the repeated work below the
 * last turn's.
 */
const FIRST_BRANCHING_SHARE = 1 / 32;

/** The MPLP run on a compiled engine (the dispatcher in solve.ts calls it after its own checks). */
export function* mplpSteps(run: AnytimeRun, opt: MplpOptions, signal: AbortSignal | undefined): RunSteps {
  const engine = run.engine, now = run.now;
  const loopy = startLoopy(run, opt);
  const state = loopy.state, buf = new OperatorBuffers();
  const branchAllowed = engine.n <= opt.branchAndBoundMaxVars;
  yield;
  let stopReason = yield* sweeps(
    loopy,
    {
      update: (oi) => mplpUpdate(engine, state, oi, buf),
      bound: () => mplpBound(engine, state),
      stopAtStall: branchAllowed,
      sweepShare: loopy.tabu ? SWEEP_SHARE_BEFORE_TABU : 1,
    },
    opt,
    signal,
  );
  // only a stalled (or time-shared) dual hands over: a run capped by maxIterations ends there
  if (!branchAllowed) {
    if (stopReason === 'stalled' && searchLeft(loopy, signal)) stopReason = yield* primalSearch(loopy, signal);
  } else {
    // small models: tabu search first, then branch and bound with the better incumbent, in turns
    const tabu = loopy.tabu && stopReason === 'stalled' && searchLeft(loopy, signal) ? newTabu(loopy) : null;
    if (tabu) yield* tabuPhase(loopy, signal, now() + (run.deadline - now()) * TABU_SHARE_BEFORE_BRANCHING, IDLE_RESTARTS_BEFORE_BRANCHING, tabu);
    let turn = Math.max(1, opt.timeLimitMs * FIRST_BRANCHING_SHARE), idle = IDLE_RESTARTS_PER_TURN;
    while (!run.gapClosed() && stopReason !== 'aborted' && !signal?.aborted && now() < run.deadline) {
      const until = tabu ? Math.min(run.deadline, now() + turn) : run.deadline;
      const r = branchAndBound(engine, state, run.bestX, run.bestBig, until, signal, 1e-7, now);
      if (r.x) run.offer(r.x, r.best);
      if (r.complete) {
        run.bound = Math.min(run.bound, Math.max(run.bestBig, r.best));
        run.finish('mplp+bb', 'optimal', true, state.belief);
        return;
      }
      stopReason = signal?.aborted ? 'aborted' : 'time';
      if (!tabu) break;
      run.progress();
      yield;
      yield* tabuPhase(loopy, signal, Math.min(run.deadline, now() + turn), idle, tabu);
      turn *= 2;
      idle *= 2;
    }
  }
  finishLoopy(loopy, 'mplp', stopReason);
}

/** MPLP on any model with at least one variable (no enumeration or tree shortcut: solve.ts decides those). */
export const mplpSolver: MapSolver<MplpOptions> = anytimeSolver('mplp', DEFAULT_MPLP_OPTIONS, mplpSteps);
