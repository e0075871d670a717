import { buildEngine, type Engine } from '../../solver/inference/engine';
import { compileRoster, decodeAssignment, encodeAssignment, makeRosterScorer, OPEN, type CompiledRoster } from '../../solver/roster';
import type { Roster, RosterAssignment } from '../../shared/roster/schema';
import { dualPass, exactlySolvable, forcedValues } from '../../solver/explain/max-marginals';

/** Time for the short dual pass behind the upper bounds (demo: 500 ms reaches 239.6 against 238.6 after the run's 3 s). */
const DUAL_MS = 600;
/** Time for repairing every candidate of one seat together (each gets an equal share, 8–60 ms)… */
const REPAIR_BUDGET_MS = 600;
/** …and the hard stop for them: on a large roster one repair pass alone takes over 100 ms. */
const REPAIR_DEADLINE_MS = 3000;

export interface ComputeInput {
  /** Identifies the roster state: the same key means the same roster and run roster. */
  modelKey: string;
  roster: Roster;
  assignment: RosterAssignment;
  seatKey: string;
}

export interface ComputedAlternative {
  personKey: string | null;
  evaluated: boolean;
  feasible: boolean;
  /** Independent scorer's total of the roster found, minus the run's roster. */
  change: number | null;
  /** Upper bound on the max-marginal minus the run's roster (null: unknown). */
  atMost: number | null;
  exact: boolean;
  moved: number;
  /** The other seats that roster changes, with their new holders (empty unless feasible). */
  movedTo: Array<[string, string | null]>;
  breaks: string[];
  impossible: boolean;
}

export type ComputeOutput =
  | { kind: 'encode-failed'; seats: string[] }
  | { kind: 'infeasible'; firstHard: string }
  | { kind: 'ok'; baseTotal: number; alternatives: ComputedAlternative[]; modelMs: number; repairMs: number };

/**
 * Per roster state: the compiled model, its engine, the run's roster encoded and the dual state
 * for the bounds. All unpinned seats of a run share one entry; a pinned seat (its own pin lifted)
 * has its own. A few entries only: the engine of a large roster takes hundreds of megabytes.
 */
type Prepared = { compiled: CompiledRoster; score: ReturnType<typeof makeRosterScorer>; engine: Engine; x: Int32Array; dual: { bound: number; beliefs: Float64Array[] | null | undefined } | null };
const models = new Map<string, Promise<Prepared | { seats: string[] }>>();
const MAX_MODELS = 3;

function prepare(key: string, roster: Roster, assignment: RosterAssignment): Promise<Prepared | { seats: string[] }> {
  const hit = models.get(key);
  if (hit) {
    models.delete(key);
    models.set(key, hit);
    return hit;
  }
  const work = (async () => {
    const compiled = compileRoster(roster);
    const enc = encodeAssignment(compiled, assignment);
    if (!enc.ok) return { seats: enc.seats };
    const engine = buildEngine(compiled.model);
    // Bounds come from a short dual (MPLP) pass started from the run's roster; exact cases need none.
    const dual = exactlySolvable(engine) ? null : await dualPass(compiled.model, enc.values, DUAL_MS);
    return { compiled, score: makeRosterScorer(roster), engine, x: enc.values, dual };
  })();
  models.set(key, work);
  if (models.size > MAX_MODELS) models.delete(models.keys().next().value!);
  work.catch(() => models.delete(key));
  return work;
}

/**
 * Max-marginals of one seat against the run's roster (see solver/explain/max-marginals.ts), every figure the
 * independent scorer's (solver/roster/score-roster) total of a decoded roster.
 */
export async function computeSeatAlternatives(input: ComputeInput): Promise<ComputeOutput> {
  const { roster, assignment, seatKey } = input;
  const t0 = Date.now();
  const prepared = await prepare(input.modelKey, roster, assignment);
  if ('seats' in prepared) return { kind: 'encode-failed', seats: prepared.seats };
  const { compiled, engine, x, dual, score } = prepared;
  const base = score(assignment);
  if (!base.feasible) return { kind: 'infeasible', firstHard: base.violations.find((v) => v.hard)?.message ?? 'a hard rule' };
  const t1 = Date.now();
  const i = compiled.seatIndex.get(seatKey)!;
  const forced = await forcedValues(compiled.model, engine, x, i, dual, { budgetMs: REPAIR_BUDGET_MS, seed: 1, deadline: Date.now() + REPAIR_DEADLINE_MS });
  const alternatives = forced.map((f): ComputedAlternative => {
    const p = compiled.domains[i][f.value];
    const personKey = p === OPEN ? null : roster.people[p].id;
    const atMostOf = (change: number | null) => {
      if (!Number.isFinite(f.bound)) return null;
      const a = f.bound - base.total;
      // the bound is never below what was found (rounding of the dual aside)
      return change === null ? a : Math.max(a, change);
    };
    if (!f.evaluated || f.assignment === null) {
      return { personKey, evaluated: false, feasible: false, change: null, atMost: atMostOf(null), exact: false, moved: 0, movedTo: [], breaks: [], impossible: f.bound === -Infinity };
    }
    const next = decodeAssignment(compiled, f.assignment).assignment;
    const check = score(next);
    const change = check.feasible ? check.total - base.total : null;
    const movedTo: Array<[string, string | null]> = check.feasible ? Object.keys({ ...next, ...assignment }).filter((s) => s !== seatKey && (next[s] ?? null) !== (assignment[s] ?? null)).map((s) => [s, next[s] ?? null]) : [];
    return {
      personKey,
      evaluated: true,
      feasible: check.feasible,
      change,
      atMost: atMostOf(change),
      exact: f.how === 'exact',
      moved: movedTo.length,
      movedTo,
      breaks: check.feasible ? [] : check.violations.filter((v) => v.hard).slice(0, 3).map((v) => v.message),
      impossible: (f.how === 'exact' && !check.feasible) || f.bound === -Infinity,
    };
  });
  return { kind: 'ok', baseTotal: base.total, alternatives, modelMs: t1 - t0, repairMs: Date.now() - t1 };
}
