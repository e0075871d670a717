/**
 * Options of the MAP solver, with every default in one place and named presets
 * for the product's uses.
 */

/** Progress report from an anytime run. */
export interface Progress {
  iteration: number;
  timeMs: number;
  /** Best feasible score so far (-Infinity while none is known). */
  score: number;
  /** Best upper bound so far. */
  bound: number;
  gap: number;
}

export type MapMethod = 'auto' | 'enumerate' | 'tree' | 'mplp' | 'maxProduct';

export interface MapOptions {
  /** Wall-clock budget for the whole run. */
  timeLimitMs: number;
  /** Cap on dual / message-passing sweeps. */
  maxIterations: number;
  /** Seed of every random choice (local-search order, tie breaks). */
  seed: number;
  /** 'auto': enumeration if tiny, exact tree pass on forests, else MPLP + decoding + local search (+ branch and bound if small). */
  method: MapMethod;
  /** Loopy max-product damping d: m ← d·m_old + (1-d)·m_new. */
  damping: number;
  /** Stop when bound - score ≤ absoluteTolerance. */
  absoluteTolerance: number;
  /** Stop when the relative gap (bound - score) / max(1, |score|) ≤ relativeGap. */
  relativeGap: number;
  /** Enumerate exhaustively when the joint state space has at most this many assignments. */
  enumerationLimit: number;
  /** Sweeps between decodings of the current beliefs. */
  decodeEvery: number;
  /** Local improvement (moves and swaps) after each decoding. */
  localSearch: boolean;
  /** Branch and bound on the reparametrized model after the dual phase when the gap stays open (models up to this many variables; 0 = off). */
  branchAndBoundMaxVars: number;
  /** Fraction of the time budget given to the dual phase before branch and bound starts. */
  dualTimeFraction: number;
  /** Stop the dual phase when the bound improves by less than this over `stallSweeps` sweeps. */
  stallTolerance: number;
  stallSweeps: number;
  /** Penalty standing in for -Infinity inside message passing; 0 = automatic (above the total soft range). */
  hardPenalty: number;
  /** Called with progress at most every `progressEveryMs`. */
  onProgress?: (p: Progress) => void;
  progressEveryMs: number;
  /** Start from this assignment (e.g. the previous published roster). */
  initial?: ArrayLike<number>;
  /**
   * Millisecond clock behind every time limit (default Date.now). The benchmark injects the
   * process CPU time so that budgets mean "on one core" on a shared machine.
   */
  clock?: () => number;
}

export const DEFAULT_MAP_OPTIONS: Readonly<MapOptions> = Object.freeze({
  timeLimitMs: 10_000,
  maxIterations: 100_000,
  seed: 1,
  method: 'auto',
  damping: 0.5,
  absoluteTolerance: 1e-6,
  relativeGap: 1e-9,
  enumerationLimit: 200_000,
  decodeEvery: 5,
  localSearch: true,
  branchAndBoundMaxVars: 200,
  dualTimeFraction: 0.5,
  stallTolerance: 1e-7,
  stallSweeps: 50,
  hardPenalty: 0,
  progressEveryMs: 100,
} satisfies MapOptions);

/** Named presets: `interactive` for previews while editing, `publish` for the run behind a published roster, `exact` for tests and checks. */
export const MAP_PRESETS = {
  interactive: { timeLimitMs: 2_000, relativeGap: 0.005 },
  publish: { timeLimitMs: 30_000, relativeGap: 1e-6 },
  exact: { timeLimitMs: 60_000, relativeGap: 0, absoluteTolerance: 1e-7, branchAndBoundMaxVars: 1_000 },
} satisfies Record<string, Partial<MapOptions>>;

export function resolveMapOptions(opts?: Partial<MapOptions>): MapOptions {
  const out: MapOptions = { ...DEFAULT_MAP_OPTIONS };
  if (opts) for (const [k, v] of Object.entries(opts)) if (v !== undefined) (out as unknown as Record<string, unknown>)[k] = v;
  return out;
}

/** Options of sum-product (marginals and log partition function). */
export interface MarginalOptions {
  maxIterations: number;
  /** Stop when no message changes by more than this (log scale). */
  tolerance: number;
  damping: number;
  timeLimitMs: number;
  enumerationLimit: number;
}

export const DEFAULT_MARGINAL_OPTIONS: Readonly<MarginalOptions> = Object.freeze({
  maxIterations: 500,
  tolerance: 1e-9,
  damping: 0.3,
  timeLimitMs: 5_000,
  enumerationLimit: 200_000,
});
