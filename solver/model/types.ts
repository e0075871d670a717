/**
 * Model types for Rotaloom's pairwise Markov network solver.
 *
 * A model is plain data: variables with finite domains and factors that score
 * joint assignments in POINTS (natural log of a factor value). Higher is better;
 * `-Infinity` marks an impossible combination (a hard constraint).
 * The score of an assignment is the sum of all factor scores.
 *
 * Keys: structured factors (allDifferent, sameKey, sparsePair) compare the KEYS
 * of values, not value indices, because different variables have different
 * domains. `keys[v]` is an identity shared across variables (in rosters: the
 * person index); a negative key (-1) means "no identity" (e.g. the seat is left
 * open) and never collides with anything. Without `keys`, key = value index.
 */

/** A discrete variable with values 0..cardinality-1. */
export interface Variable {
  name: string;
  cardinality: number;
  /** Display label per value (e.g. person names, "open"). */
  labels?: string[];
  /** Identity per value, shared across variables; -1 = none. Defaults to the value index. */
  keys?: ArrayLike<number>;
}

/** Fields every factor may carry so that explanations can name it. */
export interface FactorMeta {
  /** Stable identifier (e.g. "wish:17", "rest:4:9"). */
  id?: string;
  /** Human-readable description for explanations. */
  label?: string;
  /**
   * Marks the factor as a hard constraint. Hard factors use -Infinity for their
   * forbidden combinations and are never reported as concessions.
   */
  hard?: boolean;
}

/** Score of one variable's value: table[x]. */
export interface UnaryFactor extends FactorMeta {
  kind: 'unary';
  v: number;
  table: ArrayLike<number>;
}

/** Dense pairwise table, row-major: table[xa * K_b + xb]. */
export interface PairwiseFactor extends FactorMeta {
  kind: 'pairwise';
  a: number;
  b: number;
  table: ArrayLike<number>;
}

/**
 * No two of `vars` may take values with the same non-negative key.
 * Score: `penalty` (default -Infinity, i.e. hard) for every pair that collides.
 * Messages: O(K) per pair for two variables; for three or more variables the
 * solver uses one "at most one holder" counting constraint per key, whose LP
 * relaxation is the bipartite matching polytope.
 */
export interface AllDifferentFactor extends FactorMeta {
  kind: 'allDifferent';
  vars: number[];
  penalty?: number;
}

/**
 * Potts-like factor over keys: adds `weight` when a and b take values with the
 * same non-negative key (e.g. minimum rest: weight -Infinity or a soft penalty;
 * "work together": a positive weight). O(K) messages.
 */
export interface SameKeyFactor extends FactorMeta {
  kind: 'sameKey';
  a: number;
  b: number;
  weight: number;
}

/**
 * Sparse pairing table over keys: score(xa, xb) = entry for (key(xa), key(xb))
 * if listed, else `default`. Entries are [keyA, keyB, score]; keys may be -1.
 * O(K + entries) messages.
 */
export interface SparsePairFactor extends FactorMeta {
  kind: 'sparsePair';
  a: number;
  b: number;
  entries: Array<[number, number, number]>;
  default: number;
}

/**
 * Counting factor: s = Σ_i weight_i(x_i) over `vars`, score = score(s).
 * `weights[j]` lists [valueIndex, weight] pairs for vars[j]; unlisted values
 * weigh 0. Weights are non-negative integers (hours, shifts, nights...).
 * `score` is either a table indexed by s (entries past its end repeat the last
 * entry) or a function of s. Messages by dynamic programming over s,
 * O(n · S · w) for n variables, S the reachable sums and w listed values per var.
 */
export interface CountingFactor extends FactorMeta {
  kind: 'counting';
  vars: number[];
  weights: Array<Array<[number, number]>>;
  score: ArrayLike<number> | ((sum: number) => number);
}

/**
 * General dense table over any number of variables (as in UAI files):
 * the LAST variable varies fastest.
 */
export interface TableFactor extends FactorMeta {
  kind: 'table';
  vars: number[];
  table: ArrayLike<number>;
}

export type Factor =
  | UnaryFactor
  | PairwiseFactor
  | AllDifferentFactor
  | SameKeyFactor
  | SparsePairFactor
  | CountingFactor
  | TableFactor;

export type FactorKind = Factor['kind'];

/** A model: variables and factors. `constant` is added to every score (default 0). */
export interface Model {
  variables: Variable[];
  factors: Factor[];
  constant?: number;
  name?: string;
}

/** One value index per variable. */
export type Assignment = ArrayLike<number>;
