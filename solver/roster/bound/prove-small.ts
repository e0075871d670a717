/**
 * A proof step for small rosters: the roster's whole MIP (the `--export-lp` encoding of
 * solver/bench/highs-mip.ts) solved by HiGHS, started from the best roster found so far.
 *
 * Why: on small rosters with the weekly rest the person/shift relaxation has an integrality gap
 * (12 people × 2 weeks: its value is −34 = HiGHS's LP value, the optimum −36.5), so no dual
 * method on that decomposition can prove the roster best. HiGHS's cuts and branching close it:
 * started from the optimum it proves it in 0.2–0.7 s of CPU once its WebAssembly is warm.
 *
 * What counts as proven: HiGHS's dual bound (its own proven upper bound on the MIP, which equals
 * the roster score on every integral point), lifted by a small numerical tolerance and rounded
 * down to the score grid, is at most the incumbent's score. A better roster HiGHS finds is
 * decoded, scored with the model and with scoreRoster, and taken only when both agree.
 */
import type { Roster } from '../../../shared/roster/schema';
import { encodeMip, readMipAssignment, setMipStart } from '../../bench/highs-mip';
import { score as modelScore } from '../../model/score';
import type { CompiledRoster } from '../compile';
import { decodeAssignment } from '../decode';
import { scoreRoster } from '../score-roster';
import { roundToGrid } from './grid';
import { loadHighsRuntime, type HighsRuntime } from './highs';

/**
 * Rosters with at most this many seat values (Σ over seats of the people who may take it, open
 * included) get the proof step. Measured (solveRoster, 6 s CPU, seed 1, 2026-12-03; makeRoster
 * seed 12): 12 × 2 weeks (519) proven; 12 × 3 weeks (785) proven at 4.2 s (bound −85.75 without);
 * 16 × 2 weeks (1,038) bound 37 against 106.5 without; 12 × 4 weeks (1,051) −124 against 25;
 * 20 × 2 weeks (1,760) 33 against 26 without (HiGHS gave no bound in its time and the bundle
 * method got less); the demo has 3,283.
 */
export const PROVE_SMALL_MAX_VALUES = 1_100;

/** Σ over seats of their domain sizes: the MIP's main columns. */
export function seatValues(compiled: CompiledRoster): number {
  let n = 0;
  for (let s = 0; s < compiled.roster.seats.length; s++) n += compiled.domains[s]!.length;
  return n;
}

export interface ProveSmallOptions {
  /** Longest the MIP may run, in ms (HiGHS counts wall-clock time; the run cannot be interrupted). */
  timeLimitMs: number;
  /** Step of the score grid (bound/grid.ts); 0 when there is none. */
  grid: number;
}

export interface ProveSmallResult {
  /** The incumbent, or a better roster HiGHS found (checked by scoreRoster). */
  assignment: number[];
  score: number;
  /** HiGHS's proven upper bound rounded down to the grid (never below score); Infinity when HiGHS gave none. */
  bound: number;
  /** bound ≤ score: no roster scores more. */
  proven: boolean;
  /** HiGHS's model status, by name (optimal, time limit…). */
  status: string;
  /** Whether the returned roster is HiGHS's (better than the incumbent). */
  improved: boolean;
}

/**
 * Solve the roster's MIP from `incumbent` (a feasible assignment of compiled.model) for at most
 * options.timeLimitMs. Returns null when HiGHS cannot be loaded or fails; the caller keeps
 * what it has.
 */
export async function proveSmall(
  roster: Roster,
  compiled: CompiledRoster,
  incumbent: { assignment: ArrayLike<number>; score: number },
  options: ProveSmallOptions,
): Promise<ProveSmallResult | null> {
  const highs = await loadHighsRuntime().catch(() => null);
  if (!highs) return null;
  try {
    return solveMip(highs, roster, compiled, incumbent, options);
  } catch {
    return null;
  }
}

function solveMip(
  highs: HighsRuntime,
  roster: Roster,
  compiled: CompiledRoster,
  incumbent: { assignment: ArrayLike<number>; score: number },
  { timeLimitMs, grid }: ProveSmallOptions,
): ProveSmallResult {
  const model = compiled.model;
  const enc = encodeMip(model);
  // (getColByName is in highs' API; bound/highs.ts types only what the column generation uses)
  const mip = highs.createModel({ format: 'lp', data: enc.lp }) as ReturnType<HighsRuntime['createModel']> & { getColByName(name: string): number };
  try {
    mip.options.set({
      time_limit: Math.max(0.05, timeLimitMs / 1000),
      output_flag: false,
      // stop once bound and roster are less than one grid step apart: the rounded bound is then the score
      mip_rel_gap: 0,
      mip_abs_gap: grid > 0 ? grid / 2 : 1e-6,
      // presolve stays on: measured on 12 × 2 weeks (warm, CPU), from a roster one point below the
      // optimum 1.1 s with it against 1.65 s without; from the optimum itself 0.7 s against 0.3 s
    });
    setMipStart(enc, model, mip, incumbent.assignment);
    const { modelStatus } = mip.run();
    const status = Object.entries(highs.constants.modelStatus).find(([, v]) => v === modelStatus)?.[0] ?? String(modelStatus);
    // the incumbent is feasible, so "infeasible" can only be numerical trouble: nothing is learnt
    if (modelStatus === highs.constants.modelStatus.infeasible) return { assignment: Array.from(incumbent.assignment), score: incumbent.score, bound: Infinity, proven: false, status, improved: false };
    let assignment = Array.from(incumbent.assignment);
    let score = incumbent.score;
    let improved = false;
    if (Number(mip.info.get('primal_solution_status')) === 2) {
      const x = readMipAssignment(enc, model, mip, mip.getSolution().colValue, new Array<number>(model.variables.length).fill(0));
      const s = modelScore(model, x);
      if (s > score) {
        // taken only when the roster's own scorer agrees with the model on HiGHS's roster
        const checked = scoreRoster(roster, decodeAssignment(compiled, x).assignment);
        if (checked.feasible && Math.abs(checked.total - s) <= 1e-6 * Math.max(1, Math.abs(s))) {
          assignment = x;
          score = s;
          improved = true;
        }
      }
    }
    const dual = Number(mip.info.get('mip_dual_bound'));
    // HiGHS works to tolerances of about 1e-6; the lift keeps a bound just under a grid point from
    // rounding a whole step down (still far below the 0.25–1 point steps of rosters)
    const raw = Number.isFinite(dual) ? dual + enc.constant : Infinity;
    const lifted = raw + 1e-6 * Math.max(1, Math.abs(raw));
    const bound = Number.isFinite(lifted) ? Math.max(score, roundToGrid(lifted, model, grid)) : Infinity;
    return { assignment, score, bound, proven: score > -Infinity && bound <= score + 1e-9, status, improved };
  } finally {
    mip.dispose();
  }
}
