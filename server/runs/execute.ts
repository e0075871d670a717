import type { CompiledRoster, decodeAssignment, scoreRoster } from '../../solver/roster';
import { solveRoster } from '../../solver/roster/solve-roster';
import type { DualStart } from '../../solver/roster/lagrangian';
import type { Roster, RosterAssignment } from '../../shared/roster/schema';

export interface RunProgress {
  iteration: number;
  score: number;
  bound: number;
  gap: number;
  elapsedMs: number;
}

export interface RunOutcome {
  /** seat id (roster JSON) → person id or null. */
  assignment: Record<string, string | null>;
  score: number;
  bound: number;
  gap: number;
  /** The score with every rule, wish and pairing at its own best (concessions are measured from it); null if not finite. */
  ideal: number | null;
  feasible: boolean;
  optimal: boolean;
  stopReason: string;
  method: string;
  iterations: number;
  timeMs: number;
  timeToBestMs: number;
  /** Independent check of the answer, straight from the roster (solver/roster/score-roster). */
  check: ReturnType<typeof scoreRoster>;
  people: ReturnType<typeof decodeAssignment>['people'];
  openSeats: number;
  /** The bound's multipliers at its best (kept with the run, runs.dual): the next run of this roster starts there. */
  dual: DualStart | null;
}

/** Finite JSON: the database cannot store -Infinity, so "no feasible roster" travels as null. */
export const finite = (x: number): number | null => (Number.isFinite(x) ? x : null);

/**
 * One solve of a roster prepared by server/runs/start.ts: max-product MAP with progress and
 * cancellation, decoded and re-scored independently.
 */
export async function executeRun(
  roster: Roster,
  params: { timeLimitSeconds: number; seed: number },
  onProgress: (p: RunProgress) => void,
  signal: AbortSignal,
  /** The roster to start from (server/runs/previous-start.ts); the greedy one when it scores better. */
  start?: RosterAssignment,
  /** Multipliers of the roster's previous run (repository.previousDual): the bound starts there. */
  dualStart?: DualStart,
): Promise<{ ok: true; outcome: RunOutcome; compiled: CompiledRoster } | { ok: false; reasons: string[] }> {
  // The roster was checked when its run was started (server/runs/start.ts: shifts, feasibility in
  // words); solveRoster repeats only its own explainInfeasible guard, then starts max-product from
  // the better of the given start and a greedy roster.
  const solved = await solveRoster(
    roster,
    {
      timeLimitMs: params.timeLimitSeconds * 1000,
      seed: params.seed,
      start,
      dualStart,
      // the worker solves every run in a thread of one process: a baseline HiGHS would stay for all later runs
      highsBaseline: false,
      progressEveryMs: 250,
      onProgress: (p) => onProgress({ iteration: p.iteration, score: p.score, bound: p.bound, gap: p.gap, elapsedMs: p.timeMs }),
    },
    signal,
  );
  if (solved.status === 'infeasible') return { ok: false, reasons: solved.reasons };
  const { result, decoded, score, compiled } = solved;
  if (!result.feasible) {
    return { ok: false, reasons: ['No roster within the time limit keeps every hard rule. Loosen a hard rule (or make it soft), add people, or remove seats, then try again.'] };
  }
  return {
    ok: true,
    // The compiled model stays in the thread (not posted): solve-thread.ts computes the marginals on it.
    compiled,
    outcome: {
      assignment: decoded.assignment,
      score: result.score,
      bound: result.bound,
      gap: result.gap,
      ideal: finite(solved.ideal.total),
      feasible: result.feasible,
      optimal: result.optimal,
      stopReason: result.stopReason,
      method: result.method,
      iterations: result.iterations,
      timeMs: result.timeMs,
      timeToBestMs: result.timeToBestMs,
      check: score,
      people: decoded.people,
      openSeats: decoded.openSeats.length,
      // multipliers still all zero (the bound never got below MPLP's) are no start worth keeping
      dual: solved.dual && Object.keys(solved.dual.mu).length + Object.keys(solved.dual.nu).length > 0 ? solved.dual : null,
    },
  };
}
