/**
 * Options of the MAP solvers and of sum-product: one typed record per algorithm (as libDAI's
 * `Properties`), every default in one place, and the presets the product runs with.
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

/** What every MAP solver takes: budget, seed, stopping gap, progress, warm start, clock. */
export interface BaseMapOptions {
  /** Budget for the whole run, in milliseconds of `clock`. */
  timeLimitMs: number;
  /** Seed of every random choice (local-search order, tie breaks, restarts). */
  seed: number;
  /** Stop when bound - score ≤ absoluteTolerance. */
  absoluteTolerance: number;
  /** Stop when the relative gap (bound - score) / max(1, |score|) ≤ relativeGap. */
  relativeGap: number;
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
  /** Penalty standing in for -Infinity inside message passing; 0 = automatic (above the total soft range). */
  hardPenalty: number;
}

/** Exhaustive enumeration. */
export interface EnumerationOptions extends BaseMapOptions {
  /** Refuse (throw) above this many joint assignments. */
  maxStates: number;
}

/** Two-pass max-product on a forest; nothing beyond the base record. */
export type TreeOptions = BaseMapOptions;

/** What the two loopy algorithms share: sweeps, decoding with local search, the stall test. */
export interface LoopyOptions extends BaseMapOptions {
  /** Cap on sweeps. */
  maxIterations: number;
  /** Sweeps between decodings of the current beliefs. */
  decodeEvery: number;
  /** Local improvement (moves and swaps) after each decoding. */
  localSearch: boolean;
  /** The dual has stalled when the bound improves by less than this over `stallSweeps` sweeps. */
  stallTolerance: number;
  stallSweeps: number;
  /** Share of the budget the sweeps get on a stalled dual before the primal search takes the rest. */
  dualTimeFraction: number;
  /**
   * Tabu search (tabu.ts) after the dual stalls, on models whose operators are all small
   * (UAI-style pairwise models; rosters' long counting factors keep the older repair loop).
   */
  tabuSearch: boolean;
}

/** MPLP (mplp.ts). */
export interface MplpOptions extends LoopyOptions {
  /** Branch and bound on the reparametrized model once the dual stalls (models up to this many variables; 0 = off). */
  branchAndBoundMaxVars: number;
}

/** Damped loopy max-product (max-product.ts). */
export interface MaxProductOptions extends LoopyOptions {
  /** m ← d·m_old + (1-d)·m_new. */
  damping: number;
}

export type MapMethod = 'auto' | 'enumerate' | 'tree' | 'mplp' | 'maxProduct';

/**
 * The dispatcher's record (solve.ts): the method and the enumeration threshold, plus every
 * algorithm's options, handed on to whichever algorithm runs.
 */
export interface MapOptions extends MplpOptions, MaxProductOptions {
  /** 'auto': enumeration if tiny, exact tree pass on forests, else MPLP + decoding + local search (+ branch and bound if small). */
  method: MapMethod;
  /** 'auto' enumerates exhaustively when the joint state space has at most this many assignments. */
  enumerationLimit: number;
}

export const DEFAULT_BASE_OPTIONS: Readonly<BaseMapOptions> = Object.freeze({
  timeLimitMs: 10_000,
  seed: 1,
  absoluteTolerance: 1e-6,
  relativeGap: 1e-9,
  progressEveryMs: 100,
  hardPenalty: 0,
} satisfies BaseMapOptions);

export const DEFAULT_ENUMERATION_OPTIONS: Readonly<EnumerationOptions> = Object.freeze({ ...DEFAULT_BASE_OPTIONS, maxStates: 5_000_000 });

const DEFAULT_LOOPY_OPTIONS: Readonly<LoopyOptions> = Object.freeze({
  ...DEFAULT_BASE_OPTIONS,
  maxIterations: 100_000,
  decodeEvery: 5,
  localSearch: true,
  stallTolerance: 1e-7,
  stallSweeps: 50,
  dualTimeFraction: 0.5,
  tabuSearch: true,
});

export const DEFAULT_MPLP_OPTIONS: Readonly<MplpOptions> = Object.freeze({ ...DEFAULT_LOOPY_OPTIONS, branchAndBoundMaxVars: 200 });

export const DEFAULT_MAX_PRODUCT_OPTIONS: Readonly<MaxProductOptions> = Object.freeze({ ...DEFAULT_LOOPY_OPTIONS, damping: 0.5 });

export const DEFAULT_MAP_OPTIONS: Readonly<MapOptions> = Object.freeze({
  ...DEFAULT_MPLP_OPTIONS,
  damping: DEFAULT_MAX_PRODUCT_OPTIONS.damping,
  method: 'auto',
  enumerationLimit: 200_000,
} satisfies MapOptions);

/**
 * The option sets the product runs with, each named after its caller:
 * - `seatBounds`: the short dual pass behind a seat's "at most" figures (solver/explain/max-marginals.ts,
 *   server seat alternatives). No local search, no branch and bound: branch and bound can report a
 *   certified optimum as the bound, and bound − max b_i + b_i(v) needs the dual state's own bound;
 * - `forcedChoice`: the exact re-solve of a tiny or tree-shaped model with one choice forced;
 * - `concessionPrice`: the re-solve with one factor held at its best (solver/explain priceOfConcession);
 * - `commandLine`: `npm run solve` on a UAI file without --time-limit.
 * Roster runs go through solveRoster with the run's own time limit and seed over the defaults.
 */
export const MAP_PRESETS = {
  seatBounds: { localSearch: false, branchAndBoundMaxVars: 0, tabuSearch: false, seed: 1 },
  forcedChoice: { method: 'auto', timeLimitMs: 60_000 },
  concessionPrice: { timeLimitMs: 2_000 },
  commandLine: { timeLimitMs: 10_000, seed: 1 },
} satisfies Record<string, Partial<MapOptions>>;

/** The defaults with the caller's defined options laid over them. */
export function withDefaults<O extends object>(defaults: Readonly<O>, opts?: Partial<O>): O {
  const out = { ...defaults } as O;
  if (opts) for (const [k, v] of Object.entries(opts)) if (v !== undefined) (out as Record<string, unknown>)[k] = v;
  return out;
}

export function resolveMapOptions(opts?: Partial<MapOptions>): MapOptions {
  return withDefaults(DEFAULT_MAP_OPTIONS, opts);
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
