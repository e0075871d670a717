/** Options of the weight learner (learn-weights.ts), with their defaults in one place. */
export interface LearnOptions {
  /**
   * λ of the prior λ/2·‖w − w0‖²: how strongly the suggestion stays at the current weights.
   * In points² per (point per unit)²; larger = fewer, smaller changes.
   */
  priorStrength: number;
  /**
   * 'relative': the prior is Σ ((w_k − w0_k) / s_k)² with s_k = max(w0_k, 1), so a weight of 100
   * may move by 10 as cheaply as a weight of 1 by 0.1 (weights of different rules live on very
   * different scales); 'absolute': the plain ‖w − w0‖²; 'spread': s_k = σ̄ / σ_k with σ_k the
   * root mean square over the edits of rule k's count change (kept − proposed) and σ̄ their
   * geometric mean, so that the prior is on the points a rule moves in a typical edit (a rule
   * counted in hours does not outweigh one counted in weekends); 'relativeSpread': both factors.
   */
  priorScale: 'relative' | 'absolute' | 'spread' | 'relativeSpread';
  /**
   * 'nSlack': one slack per edit, each edit's rivals its own constraints (Tsochantaridis et al. 2005);
   * 'oneSlack': one slack shared by all edits, each constraint the mean over the edits of a rival
   * each (Joachims, Finley & Yu, "Cutting-plane training of structural SVMs", Machine Learning 2009),
   * built from every rival found so far before the oracle is asked again.
   */
  formulation: 'nSlack' | 'oneSlack';
  /** oneSlack: most aggregated constraints added from the found rivals between two oracle rounds. */
  cacheRounds: number;
  /** Margin asked of each kept roster over a rival, per seat where they differ (points): Δ of margin rescaling. */
  marginPerSeat: number;
  /** Cutting-plane rounds: each asks the solver once per edit for its most violating roster. 0 = only the proposed rosters. */
  rounds: number;
  /** Time limit of one oracle call (solveRoster on the seats the coordinator changed). */
  oracleTimeLimitMs: number;
  /** Wall-clock budget of the whole learning call; the oracle rounds stop when it is spent. */
  timeLimitMs: number;
  /** Most sweeps of dual coordinate ascent per solve of the working-set problem (it stops earlier once α settles). */
  dualSweeps: number;
  /**
   * Dual coordinate ascent also moves α between two constraints of an edit whose α sum is at its
   * cap (single steps cannot move then). The 1-slack formulation always does, its one group being
   * at the cap whenever the slack is positive.
   */
  dualPairSteps: boolean;
  /** A rival joins the working set when it violates its margin by more than this (points). */
  violationTolerance: number;
  /** Weights below this are reported as 0 (a rule the edits say not to weigh at all). */
  zeroBelow: number;
  seed: number;
  /**
   * Millisecond clock behind every time limit, the oracle's included (tests inject one that moves a
   * fixed step per reading, so that a seeded run does the same work on a busy machine as on an idle one).
   */
  clock?: () => number;
}

export const DEFAULT_LEARN_OPTIONS: Readonly<LearnOptions> = Object.freeze({
  priorStrength: 1,
  priorScale: 'relative',
  formulation: 'nSlack',
  cacheRounds: 200,
  marginPerSeat: 1,
  rounds: 3,
  oracleTimeLimitMs: 250,
  timeLimitMs: 20_000,
  dualSweeps: 2000,
  dualPairSteps: false,
  violationTolerance: 1e-3,
  zeroBelow: 1e-3,
  seed: 1,
} satisfies LearnOptions);

/** Named presets: `interactive` for a suggestion computed while the coordinator waits. */
export const LEARN_PRESETS = {
  interactive: { timeLimitMs: 8_000, oracleTimeLimitMs: 150, rounds: 2 },
  thorough: { timeLimitMs: 120_000, oracleTimeLimitMs: 1_000, rounds: 6 },
} satisfies Record<string, Partial<LearnOptions>>;

export function resolveLearnOptions(opts?: Partial<LearnOptions>): LearnOptions {
  const out: LearnOptions = { ...DEFAULT_LEARN_OPTIONS };
  if (opts) for (const [k, v] of Object.entries(opts)) if (v !== undefined) (out as unknown as Record<string, unknown>)[k] = v;
  return out;
}
