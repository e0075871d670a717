/**
 * A proximal bundle method for the dual of the person/shift decomposition (lagrangian.ts), as in
 * Kappes, Savchynskyy and Schnörr, "A bundle approach to efficient MAP-inference by Lagrangian
 * relaxation" (CVPR 2012), after Kiwiel's proximal bundle method (Math. Programming 46, 1990).
 *
 * L(λ), λ = (μ, ν), is convex and piecewise linear; every evaluation (the oracle,
 * evaluateLagrangian) gives its value and a subgradient g, hence the cut L(λ) ≥ L_i + g_i·(λ − λ_i).
 * Around the stability centre λ̂ (the best point of the serious steps) the cuts read
 * L(λ̂ + d) ≥ L(λ̂) + g_i·d − α_i with linearization errors α_i ≥ 0, and the next trial point is
 *
 *   d = argmin_d  max_i (g_i·d − α_i) + (1/2t) ‖d‖²_M⁻¹          (M = diag(1 for μ, NU_SCALE for ν))
 *
 * solved through its dual over the bundle's weights θ (dimension = number of cuts, not of λ):
 *
 *   min_θ  (t/2) θᵀQθ + αᵀθ   s.t. θ ≥ 0, Σθ = 1,     Q_ij = g_iᵀ M g_j,
 *   d = −t M ĝ,  ĝ = Σ θ_i g_i (the aggregate subgradient),  predicted decrease v = t ĝᵀMĝ + θ·α.
 *
 * A trial point that achieves at least `seriousFraction` of the predicted decrease becomes the new
 * centre (serious step); otherwise only its cut joins the bundle (null step), which makes the next
 * model better where it was wrong. The QP is solved by npm `quadprog` (Goldfarb–Idnani).
 * Every multiplier here is free (μ dualises an equality, ν a conjugate that holds for any ν), so
 * the QP has no constraints beyond the simplex and the trial point needs no projection.
 *
 * Proximity weight t: the gap rule of Kappes et al., t = γ (L(λ̂) − target) / ‖ĝ‖²_M with the
 * best known roster's score as target (a Polyak step on the aggregate subgradient), kept within
 * [tMin, tMax]·t₀. Unlike a subgradient step, t need not go to 0 for convergence: the bundle's
 * model, not a shrinking step, makes the steps short near the optimum.
 *
 * Bundle: at most `maxCuts` cuts; a cut whose weight stayed 0 for `maxIdle` QPs is dropped, and when
 * the bundle is full the idle cut that has been idle longest goes; when every cut carries weight,
 * they are replaced by their aggregate (a convex combination of cuts is a cut), which keeps the
 * convergence guarantee.
 *
 * Every evaluated L is an upper bound on the model's best score (weak duality), so `best` is valid
 * at any moment and never rises.
 */
import { solveQP } from 'quadprog';
import { evaluateLagrangian, NU_SCALE, type LagrangianSetup } from '../lagrangian';

export interface BundleOptions {
  /** Most cuts kept (the QP's dimension). */
  maxCuts: number;
  /** A cut whose weight stayed 0 this many QPs in a row is dropped. */
  maxIdle: number;
  /** Serious step when L falls by at least this share of the model's predicted decrease. */
  seriousFraction: number;
  /**
   * How t is set: 'gap' — γ (L(λ̂) − target) / ‖ĝ‖² on the last aggregate; 'gapNewest' — the same
   * on the newest cut's subgradient; 'adaptive' — the gap rule once, then ×growth after a serious
   * step the model predicted well (ratio ≥ ½) and ×shrink after `nullsToShrink` null steps in a row.
   */
  stepRule: 'gap' | 'gapNewest' | 'adaptive';
  /** γ of the gap rule t = γ (L(λ̂) − target) / ‖ĝ‖². */
  gapStep: number;
  growth: number;
  shrink: number;
  nullsToShrink: number;
  /**
   * t stays within [tMin, tMax] times the first t. Measured on the demo (1,391 μ, target 17.75,
   * CPU): the bound after 2 / 3 / 5 s was 66.9 / 57.0 / 35.5 with tMax 3, 41.9 / 34.1 / 31.3 with
   * 10, 45.3 / 40.4 / 29.5 with 30, and with 1,000 the gap rule's t ran away (225 after 1 s,
   * nearly all null steps); the deflected subgradient gave 118.4 / 45.0 / 35.1.
   */
  tMin: number;
  tMax: number;
  /** Stop (converged) once the predicted decrease is below this share of max(1, |L(λ̂)|). */
  tolerance: number;
}

export const DEFAULT_BUNDLE_OPTIONS: Readonly<BundleOptions> = Object.freeze({
  maxCuts: 40,
  maxIdle: 20,
  seriousFraction: 0.1,
  stepRule: 'gap',
  gapStep: 1,
  growth: 2,
  shrink: 0.5,
  nullsToShrink: 3,
  tMin: 1e-3,
  tMax: 10,
  tolerance: 1e-9,
});

interface Cut {
  /** Subgradient, flat over λ = (μ, ν). */
  g: Float64Array;
  /** L(λ) ≥ constant + g·λ. */
  constant: number;
  /** Linearization error at the centre: L(λ̂) − constant − g·λ̂ (≥ 0 up to rounding). */
  error: number;
  /** QPs in a row that gave this cut weight 0. */
  idle: number;
}

/** Where a bundle run stands; pass it back in to continue. */
export interface BundleState {
  /** Flat multipliers of the next trial point: μ first, then each person's ν. */
  trial: Float64Array;
  center: Float64Array;
  /** L at the centre (Infinity before the first evaluation). */
  centerValue: number;
  /** Lowest L so far: a proven upper bound on the model's best score. */
  best: number;
  /** Multipliers (flat) at `best`. */
  bestAt: Float64Array;
  /** The people's seats at the best L. */
  schedules: number[][];
  cuts: Cut[];
  /** Q_ij = g_iᵀ M g_j of the cuts, in their order. */
  gram: number[][];
  /** Proximity weight and its first value (the bounds tMin, tMax are relative to it). */
  t: number;
  t0: number;
  /** ‖ĝ‖²_M of the last QP's aggregate subgradient, for the gap rule. */
  aggregateNorm: number;
  /** The last QP's aggregate cut (L(λ) ≥ constant + g·λ: a convex combination of cuts) and its predicted decrease. */
  aggregate?: { g: Float64Array; constant: number };
  predicted: number;
  iterations: number;
  serious: number;
  nulls: number;
  /** Null steps since the last serious one. */
  nullRun: number;
  /** The predicted decrease fell below the tolerance: λ̂ is optimal to that tolerance. */
  converged: boolean;
  /** Metric M (1 for μ, NU_SCALE for ν), flat. */
  metric: Float64Array;
}

/** Flat length of λ and views of a flat array as (μ, ν per person). */
function views(setup: LagrangianSetup, flat: Float64Array): { mu: Float64Array; nu: Float64Array[] } {
  let offset = setup.nMu;
  const nu = setup.people.map((plan) => {
    const view = flat.subarray(offset, offset + plan.period.length);
    offset += plan.period.length;
    return view;
  });
  return { mu: flat.subarray(0, setup.nMu), nu };
}

function dimension(setup: LagrangianSetup): number {
  return setup.nMu + setup.nNu;
}

/** A new run starting at μ, ν (e.g. a warm start from an earlier run; zeros by default). */
export function newBundleState(setup: LagrangianSetup, start?: { mu: Float64Array; nu: Float64Array[] }): BundleState {
  const n = dimension(setup);
  const trial = new Float64Array(n);
  if (start) {
    const v = views(setup, trial);
    v.mu.set(start.mu);
    v.nu.forEach((view, i) => view.set(start.nu[i]!));
  }
  const metric = new Float64Array(n).fill(1);
  metric.fill(NU_SCALE, setup.nMu);
  return {
    trial,
    center: Float64Array.from(trial),
    centerValue: Infinity,
    best: Infinity,
    bestAt: Float64Array.from(trial),
    schedules: [],
    cuts: [],
    gram: [],
    t: 0,
    t0: 0,
    aggregateNorm: 0,
    predicted: 0,
    iterations: 0,
    serious: 0,
    nulls: 0,
    nullRun: 0,
    converged: false,
    metric,
  };
}

/** The multipliers at the best L, as evaluateLagrangian and dualOf take them. */
export function bundleBest(setup: LagrangianSetup, state: BundleState): { mu: Float64Array; nu: Float64Array[] } {
  return views(setup, state.bestAt);
}

function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let q = 0; q < a.length; q++) s += a[q]! * b[q]!;
  return s;
}

function metricDot(a: Float64Array, b: Float64Array, m: Float64Array): number {
  let s = 0;
  for (let q = 0; q < a.length; q++) s += a[q]! * m[q]! * b[q]!;
  return s;
}

/**
 * Weights θ on the simplex minimising (t/2) θᵀQθ + αᵀθ (quadprog); null when it fails (the
 * caller then steps along the newest cut alone).
 */
export function bundleWeights(gram: number[][], errors: number[], t: number): number[] | null {
  const m = errors.length;
  if (m === 1) return [1];
  let diag = 0;
  for (let i = 0; i < m; i++) diag = Math.max(diag, gram[i]![i]!);
  // Q is only semidefinite (equal or dependent cuts); a ridge far below its scale makes the
  // Cholesky factor exist without moving the solution measurably
  const ridge = 1e-10 * Math.max(1e-6, t * diag) + 1e-14;
  const D: number[][] = [[]];
  const dvec: number[] = [0];
  const A: number[][] = [[]];
  for (let i = 1; i <= m; i++) {
    const row: number[] = [0];
    for (let j = 1; j <= m; j++) row.push(t * gram[i - 1]![j - 1]! + (i === j ? ridge : 0));
    D.push(row);
    dvec.push(-errors[i - 1]!);
    // constraint columns: 1 = Σθ (equality), then θ_j ≥ 0
    const a: number[] = [0, 1];
    for (let j = 1; j <= m; j++) a.push(i === j ? 1 : 0);
    A.push(a);
  }
  const b0: number[] = [0, 1];
  for (let j = 1; j <= m; j++) b0.push(0);
  const r = solveQP(D, dvec, A, b0, 1);
  if (r.message || !r.solution) return null;
  const theta = r.solution.slice(1, m + 1).map((v) => (v > 0 ? v : 0));
  const sum = theta.reduce((s, v) => s + v, 0);
  if (!(sum > 0) || theta.some((v) => !Number.isFinite(v))) return null;
  return theta.map((v) => v / sum);
}

/**
 * Bundle iterations (one oracle call each) until `deadline` (by `now`), `maxIterations` more
 * calls, or convergence. `target`: a known roster's score (a lower bound on the dual's optimum);
 * without one, 1 % below the best L, as the subgradient does.
 */
export function bundleSteps(
  setup: LagrangianSetup,
  state: BundleState,
  run: { deadline: number; now: () => number; target?: number; maxIterations?: number },
  options: BundleOptions = DEFAULT_BUNDLE_OPTIONS,
): BundleState {
  const n = dimension(setup);
  const gradient = new Float64Array(n);
  const gradientViews = views(setup, gradient);
  const trialViews = views(setup, state.trial);
  const maxIterations = run.maxIterations ?? Infinity;
  for (let k = 0; k < maxIterations && !state.converged; k++) {
    if (k > 0 && run.now() > run.deadline) break;
    const { L, schedules } = evaluateLagrangian(setup, trialViews.mu, trialViews.nu, gradientViews.mu, gradientViews.nu);
    state.iterations++;
    if (L < state.best) {
      state.best = L;
      state.bestAt.set(state.trial);
      state.schedules = schedules;
    }
    if (!Number.isFinite(L)) {
      // L = −∞: some subproblem has no solution at all (the roster is infeasible); nothing to descend
      state.converged = true;
      break;
    }
    const g = Float64Array.from(gradient);
    const constant = L - dot(g, state.trial);
    if (state.cuts.length === 0) {
      state.center.set(state.trial);
      state.centerValue = L;
    } else {
      if (L <= state.centerValue - options.seriousFraction * state.predicted) {
        if (options.stepRule === 'adaptive' && state.centerValue - L >= 0.5 * state.predicted) state.t *= options.growth;
        state.center.set(state.trial);
        state.centerValue = L;
        state.serious++;
        state.nullRun = 0;
        // the errors are measured at the centre: move them with it
        for (const cut of state.cuts) cut.error = Math.max(0, L - cut.constant - dot(cut.g, state.center));
      } else {
        state.nulls++;
        if (options.stepRule === 'adaptive' && ++state.nullRun >= options.nullsToShrink) {
          state.t *= options.shrink;
          state.nullRun = 0;
        }
      }
    }
    addCut(state, { g, constant, error: Math.max(0, state.centerValue - constant - dot(g, state.center)), idle: 0 }, options);
    // proximity weight: the gap rule on the latest aggregate (the new cut alone at the start)
    const target = run.target !== undefined && run.target < state.best ? run.target : state.best - Math.max(1, Math.abs(state.best) * 0.01);
    const newest = metricDot(g, g, state.metric);
    const normForT = options.stepRule === 'gapNewest' || state.cuts.length === 1 || state.aggregateNorm <= 0 ? newest : state.aggregateNorm;
    if (newest === 0 && state.cuts.length === 1) {
      // a zero subgradient: both sides agree, L(λ̂) is the relaxation's optimum
      state.converged = true;
      break;
    }
    const tGap = normForT > 0 ? (options.gapStep * Math.max(0, state.centerValue - target)) / normForT : Infinity;
    if (state.t0 === 0) state.t0 = tGap > 0 && Number.isFinite(tGap) ? tGap : 1 / Math.max(newest, 1e-12);
    const proposed = options.stepRule === 'adaptive' && state.t > 0 ? state.t : tGap;
    state.t = Math.min(options.tMax * state.t0, Math.max(options.tMin * state.t0, proposed));
    // the QP over the bundle's weights, then the trial point λ̂ − t M ĝ
    const errors = state.cuts.map((c) => c.error);
    const theta = bundleWeights(state.gram, errors, state.t) ?? state.cuts.map((_, i) => (i === state.cuts.length - 1 ? 1 : 0));
    const aggregate = new Float64Array(n);
    let aggregateError = 0, aggregateConstant = 0;
    state.cuts.forEach((cut, i) => {
      const w = theta[i]!;
      if (w > 1e-12) {
        cut.idle = 0;
        for (let q = 0; q < n; q++) aggregate[q] += w * cut.g[q]!;
        aggregateError += w * cut.error;
        aggregateConstant += w * cut.constant;
      } else cut.idle++;
    });
    state.aggregateNorm = metricDot(aggregate, aggregate, state.metric);
    state.aggregate = { g: aggregate, constant: aggregateConstant };
    state.predicted = state.t * state.aggregateNorm + aggregateError;
    if (state.predicted <= options.tolerance * Math.max(1, Math.abs(state.centerValue))) {
      state.converged = true;
      break;
    }
    for (let q = 0; q < n; q++) state.trial[q] = state.center[q]! - state.t * state.metric[q]! * aggregate[q]!;
  }
  return state;
}

/** Add a cut (and its row of Q); make room first by dropping idle cuts or aggregating. */
function addCut(state: BundleState, cut: Cut, options: BundleOptions): void {
  // cuts idle too long go
  for (let i = state.cuts.length - 1; i >= 0; i--) if (state.cuts[i]!.idle >= options.maxIdle) removeCut(state, i);
  if (state.cuts.length >= options.maxCuts) {
    let longest = -1;
    state.cuts.forEach((c, i) => {
      if (c.idle > 0 && (longest < 0 || c.idle > state.cuts[longest]!.idle)) longest = i;
    });
    if (longest >= 0) removeCut(state, longest);
    else if (state.aggregate) {
      // every cut carries weight: their aggregate stands in for all of them
      const { g, constant } = state.aggregate;
      state.cuts = [];
      state.gram = [];
      pushCut(state, { g: Float64Array.from(g), constant, error: Math.max(0, state.centerValue - constant - dot(g, state.center)), idle: 0 });
    } else removeCut(state, 0);
  }
  pushCut(state, cut);
}

function pushCut(state: BundleState, cut: Cut): void {
  const row = state.cuts.map((c) => metricDot(c.g, cut.g, state.metric));
  row.push(metricDot(cut.g, cut.g, state.metric));
  state.gram.forEach((r, i) => r.push(row[i]!));
  state.gram.push(row);
  state.cuts.push(cut);
}

function removeCut(state: BundleState, i: number): void {
  state.cuts.splice(i, 1);
  state.gram.splice(i, 1);
  for (const r of state.gram) r.splice(i, 1);
}
