/**
 * The one interface every MAP algorithm implements (enumeration, tree, MPLP, max-product, the
 * 'auto' dispatcher; the roster's Lagrangian too, see `MapSolver`), and the
 * result they all return.
 */
import type { Model } from '../model/types';
import type { BaseMapOptions } from './options';

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

/**
 * A MAP algorithm: `solve(input, options, signal)` resolves (never rejects on abort) with the best
 * assignment found and a proven upper bound. `defaults` is the algorithm's full options record;
 * callers pass only what they change.
 *
 * `Input` is a Model for the general algorithms. A relaxation that needs more structure takes
 * its own input: the roster's person/shift Lagrangian is `lagrangianSolver`
 * (solver/roster/bound/lagrangian-solver.ts), a `MapSolver<LagrangianSolverOptions,
 * { compiled, incumbent }>` returning the incumbent's assignment (or a better one it found) with
 * the lowest L(μ, ν) as its bound.
 */
export interface MapSolver<Options extends BaseMapOptions = BaseMapOptions, Input = Model> {
  readonly name: string;
  readonly defaults: Readonly<Options>;
  solve(input: Input, options?: Partial<Options>, signal?: AbortSignal): Promise<MapResult>;
  /** The same run without yielding to the event loop (the signal is still checked). */
  solveSync?(input: Input, options?: Partial<Options>, signal?: AbortSignal): MapResult;
}

export function relativeGap(score: number, bound: number): number {
  if (score === -Infinity) return bound === -Infinity ? 0 : Infinity;
  const g = (bound - score) / Math.max(1, Math.abs(score));
  return g < 0 ? 0 : g;
}
