/**
 * Tabu search over single-variable moves on the big-M model (Glover 1989; the one-flip form is
 * the usual strong heuristic for spin glasses and QUBO, e.g. Palubeckis 2004, "Multistart tabu
 * search strategies for the unconstrained binary quadratic optimization problem"):
 *
 *   each step applies the best move (i, v), v ≠ x_i, by Δ_i(v) = s(x_{i←v}) − s(x), even when
 *   Δ < 0, over the moves whose variable is not tabu (a tabu move is taken when it beats the
 *   best score found: aspiration); the moved variable stays tabu for `tenure` steps.
 *
 * The local scores s(x_{i←v}) up to a constant are kept for every (i, v) and refreshed only for
 * the moved variable and its neighbours, so a step costs O(Σ_i K_i) for the scan plus the
 * neighbours' refresh. After `stagnation` steps without a new best the search restarts from the
 * best assignment with a random share of its variables changed.
 *
 * Precondition: every operator is small (`tabuApplies`), so a variable's neighbours are few;
 * rosters' long counting factors would make each refresh touch the whole roster.
 */
import type { Engine } from './engine';
import { engineScore } from './engine';
import { LocalSearch } from './local-search';

/** Operators of at most this many variables keep the neighbour refresh cheap. */
const MAX_ARITY = 8;
/** Σ_i K_i above this makes the per-step scan too slow to pay. */
const MAX_MOVES = 200_000;
/**
 * Base tenure as a share of the variables. Measured on ±J spin glasses of 100 and 150 spins
 * (CPU time until tabu alone reached the HiGHS optimum, 8 instances × 4 seeds, 3 s cap): base
 * n/10 (15 at 150 spins) missed 7 of 32 in 30.7 s in all; 25 missed 2 (18.9 s), 30 missed 2
 * (14.7 s), 35 missed 1 (13.2 s); 8 missed 16 and 50 missed 6. A short tenure lets the search
 * fall back into the basin it just left.
 */
const TENURE_SHARE = 0.2;

export function tabuApplies(engine: Engine): boolean {
  let moves = 0;
  for (let i = 0; i < engine.n; i++) moves += engine.card[i]!;
  return engine.n > 1 && moves <= MAX_MOVES && engine.ops.every((op) => op.vars.length <= MAX_ARITY);
}

export interface TabuOptions {
  /** Steps a moved variable stays tabu: base + a random 0..base/2 (default TENURE_SHARE · n, between 5 and 40). */
  tenure?: number;
  /** Steps without a new best before a restart (default max(1000, 5 n)). */
  stagnation?: number;
  /** Share of the variables changed at random on a restart (default 0.3). */
  perturbation?: number;
}

export class TabuSearch {
  readonly best: Int32Array;
  /** Big-M score of `best`. */
  bestScore: number;
  steps = 0;
  restarts = 0;
  /** Restarts since the last new best. */
  idleRestarts = 0;
  private ls: LocalSearch;
  private current: number;
  private local: Float64Array;
  private offset: Int32Array;
  /** Per variable, its own stretch of `local` (made once: LocalSearch.local writes into it directly). */
  private localOf: Float64Array[];
  private neighbours: Int32Array[];
  private tabuUntil: Float64Array;
  private sinceBest = 0;
  private readonly tenure: number;
  private readonly stagnation: number;
  private readonly perturbation: number;

  constructor(
    private engine: Engine,
    start: ArrayLike<number>,
    private random: () => number,
    options: TabuOptions = {},
  ) {
    const n = engine.n;
    this.ls = new LocalSearch(engine, start, random);
    this.best = Int32Array.from(this.ls.x);
    this.current = engineScore(engine, this.ls.x);
    this.bestScore = this.current;
    this.offset = new Int32Array(n + 1);
    for (let i = 0; i < n; i++) this.offset[i + 1] = this.offset[i]! + engine.card[i]!;
    this.local = new Float64Array(this.offset[n]!);
    this.localOf = Array.from({ length: n }, (_, i) => this.local.subarray(this.offset[i]!, this.offset[i + 1]!));
    this.neighbours = Array.from({ length: n }, (_, i) => {
      const seen = new Set<number>();
      for (const oi of engine.adjOp[i]!) for (const j of engine.ops[oi]!.vars) if (j !== i) seen.add(j);
      return Int32Array.from(seen);
    });
    this.tabuUntil = new Float64Array(n);
    this.tenure = options.tenure ?? Math.max(5, Math.min(40, Math.round(n * TENURE_SHARE)));
    this.stagnation = options.stagnation ?? Math.max(1000, 5 * n);
    this.perturbation = options.perturbation ?? 0.3;
    for (let i = 0; i < n; i++) this.refresh(i);
  }

  private refresh(i: number): void {
    this.ls.local(i, this.localOf[i]!);
  }

  private move(i: number, v: number, gain: number): void {
    this.ls.set(i, v);
    this.current += gain;
    this.refresh(i);
    for (const j of this.neighbours[i]!) this.refresh(j);
  }

  /** Steps until `until()` says stop (checked every 64 steps); returns the best big-M score. */
  run(until: () => boolean): number {
    const engine = this.engine, n = engine.n, x = this.ls.x, local = this.local, off = this.offset;
    const eps = 1e-9;
    for (;;) {
      if ((this.steps & 63) === 0 && until()) break;
      this.steps++;
      let bi = -1, bv = -1, bg = -Infinity;
      for (let i = 0; i < n; i++) {
        const o = off[i]!, k = engine.card[i]!, cur = local[o + x[i]!]!;
        const tabu = this.tabuUntil[i]! > this.steps;
        for (let v = 0; v < k; v++) {
          if (v === x[i]) continue;
          const g = local[o + v]! - cur;
          // ties broken at random so plateaus (common with ±J couplings) are crossed
          if (g > bg + eps || (g > bg - eps && this.random() < 0.5)) {
            if (tabu && !(this.current + g > this.bestScore + eps)) continue;
            bi = i;
            bv = v;
            bg = g;
          }
        }
      }
      if (bi < 0) {
        // every move is tabu: release the oldest
        this.tabuUntil.fill(0);
        continue;
      }
      this.move(bi, bv, bg);
      this.tabuUntil[bi] = this.steps + this.tenure + Math.floor(this.random() * (this.tenure / 2 + 1));
      if (this.current > this.bestScore + eps) {
        // the running sum drifts; the exact big-M score is what is kept
        this.current = engineScore(engine, x);
        if (this.current > this.bestScore + eps) {
          this.bestScore = this.current;
          this.best.set(x);
          this.sinceBest = 0;
          this.idleRestarts = 0;
          continue;
        }
      }
      if (++this.sinceBest >= this.stagnation) this.restart();
    }
    return this.bestScore;
  }

  private restart(): void {
    const engine = this.engine, n = engine.n;
    this.restarts++;
    this.idleRestarts++;
    this.sinceBest = 0;
    this.tabuUntil.fill(0);
    for (let i = 0; i < n; i++) {
      let v = this.best[i]!;
      if (this.random() < this.perturbation) v = Math.floor(this.random() * engine.card[i]!);
      this.ls.set(i, v);
    }
    for (let i = 0; i < n; i++) this.refresh(i);
    this.current = engineScore(engine, this.ls.x);
  }
}
