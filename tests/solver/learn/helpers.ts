/**
 * A synthetic coordinator with hidden weights, and Kendall's τ written out here, independently of
 * the learner: τ-b = (C − D) / √((n0 − t_x)(n0 − t_y)) over all pairs (Kendall 1945, "The treatment
 * of ties in ranking problems"), O(n²), which is plenty for a dozen weights.
 */
import type { Roster, RosterAssignment, RuleSet } from '../../../shared/roster/schema';
import { makeRoster, seededRandom } from '../../../shared/demo/make-roster';
import { makeRosterScorer } from '../../../solver/roster/score-roster';
import { solveRoster } from '../../../solver/roster/solve-roster';

const ALL = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'] as const;

/**
 * A short-staffed team (five seats a day for `people`), so that every roster trades rules against
 * each other; every rule soft (whatever rules the catalogue has), so each has a weight to learn.
 */
export function fixture(seed: number, people: number): Roster {
  const base = makeRoster({
    people,
    weeks: 2,
    seed,
    wishesPerPerson: 1,
    patterns: [
      { label: 'early', weekdays: [...ALL], start: '07:00', end: '15:00', seats: [{ skill: 'medication', count: 1 }, { skill: null, count: 1 }] },
      { label: 'late', weekdays: [...ALL], start: '15:00', end: '23:00', seats: [{ skill: null, count: 2 }] },
      { label: 'night', weekdays: [...ALL], start: '23:00', end: '07:00', seats: [{ skill: 'night-lead', count: 1 }] },
    ],
  });
  const rules: Record<string, unknown> = { ...base.rules };
  for (const [k, v] of Object.entries(rules)) if (typeof (v as { hard?: unknown }).hard === 'boolean') rules[k] = { ...(v as object), hard: false };
  // tighter limits where the rule set has them, so that short staffing reaches those rules too
  const tighten: Record<string, object> = { maxNightsInRow: { nights: 2 }, maxConsecutiveDays: { days: 4 }, nightShiftLength: { hours: 7 }, averageWeeklyHours: { hours: 40 }, nightAverage: { hours: 7 } };
  for (const [k, v] of Object.entries(tighten)) if (rules[k]) rules[k] = { ...(rules[k] as object), ...v };
  return { ...base, rules: rules as Roster['rules'] };
}

const SPREAD = [12, 3, 20, 0.5, 6, 15, 2, 9, 4, 30, 1.5, 7, 10, 5];

/**
 * Hidden weights for whatever rules there are: coverage first, the rest spread over 0.5–30 in an
 * order unlike the defaults. `shuffle` > 0 deals the same values out in a seeded random order
 * (the check across seeds: a learner tuned to one order would show it there).
 */
export function hiddenWeights(keys: readonly string[], shuffle = 0): Record<string, number> {
  let spread = [...SPREAD];
  if (shuffle > 0) {
    const rnd = seededRandom(1000 + shuffle);
    spread = spread.map((x) => [rnd(), x] as const).sort((a, b) => a[0] - b[0]).map((x) => x[1]);
  }
  return Object.fromEntries(keys.map((k, i) => [k, k === 'coverage' ? 40 : spread[i % spread.length]]));
}

/** Up to `perRoster` edits on each fixture roster (seed, people) by the coordinator who goes by `hidden`. */
export async function editsFrom(seeds: readonly (readonly [number, number])[], perRoster: number, hidden: Record<string, number>, kind: CoordinatorKind = 'single'): Promise<SyntheticEdit[]> {
  const out: SyntheticEdit[] = [];
  for (const [seed, people] of seeds) {
    const r = fixture(seed, people);
    out.push(...(await syntheticEdits(r, rulesWith(r.rules, hidden as never), perRoster, seed, 1000, countingClock(), kind)));
  }
  return out;
}

export function kendallTauB(x: readonly number[], y: readonly number[]): number {
  let concordant = 0;
  let discordant = 0;
  let tiesX = 0;
  let tiesY = 0;
  let pairs = 0;
  for (let i = 0; i < x.length; i++)
    for (let j = i + 1; j < x.length; j++) {
      pairs++;
      const a = Math.sign(x[i] - x[j]);
      const b = Math.sign(y[i] - y[j]);
      if (a === 0) tiesX++;
      if (b === 0) tiesY++;
      if (a * b > 0) concordant++;
      else if (a * b < 0) discordant++;
    }
  const denom = Math.sqrt((pairs - tiesX) * (pairs - tiesY));
  return denom === 0 ? 0 : (concordant - discordant) / denom;
}

/** The roster's rule set with the given soft weights (what the coordinator privately goes by). */
export function rulesWith(rules: RuleSet, weights: Partial<Record<keyof RuleSet, number>>): RuleSet {
  const out = { ...rules } as Record<string, unknown>;
  for (const [k, w] of Object.entries(weights)) out[k] = { ...(rules as Record<string, object>)[k], weight: w };
  return out as RuleSet;
}

/**
 * A millisecond clock that moves `stepMs` per reading. Time limits then count readings, so a seeded
 * solve does the same work on a loaded CI machine as on an idle one (with the wall clock the
 * coordinator's first roster, and so every edit after it, depended on the machine's load).
 */
export function countingClock(stepMs = 1): () => number {
  let t = 0;
  return () => (t += stepMs);
}

export type SyntheticEdit = { roster: Roster; kept: RosterAssignment; proposed: RosterAssignment; gain: number };

/**
 * How the synthetic coordinator edits. 'single': one seat reassigned or two seats swapped, the best
 * such change by brute force with scoreRoster. 'day' and 'week': a stretch of the roster reworked to
 * their liking, the way a coordinator redoes a day or a week: the seats of one day (or of seven days
 * in a row) re-planned by the solver under the hidden weights, every seat outside the stretch pinned
 * as it is. 'resolve': the coordinator re-plans the whole roster under their own weights (the
 * solver's roster under the hidden weights, from the proposed one): one edit per roster.
 */
export type CoordinatorKind = 'single' | 'day' | 'week' | 'resolve';
export const COORDINATOR_KINDS: readonly CoordinatorKind[] = ['single', 'day', 'week', 'resolve'];

const DAY_MS = 86_400_000;

/**
 * The solver's roster under the roster's own (current) weights, then a session of edits by a
 * coordinator who goes by `hidden`, each of the kind `kind` (see CoordinatorKind). Each edit is
 * saved, so the next starts from it: its proposed roster is the previous kept one, as with manual
 * saves based on the last run. Whatever proposes a change (brute force or the solver), the change
 * is kept only if scoreRoster under the hidden weights scores it strictly higher, so every edit
 * strictly raises the hidden-weight score, checked outside the solver and the learner.
 */
export async function syntheticEdits(roster: Roster, hidden: RuleSet, count: number, seed: number, solveMs = 1000, clock: () => number = countingClock(), kind: CoordinatorKind = 'single', proposalRules?: RuleSet): Promise<SyntheticEdit[]> {
  const proposalRoster = proposalRules ? { ...roster, rules: proposalRules } : roster;
  const solved = await solveRoster(proposalRoster, { timeLimitMs: solveMs, seed, lagrangianShare: 0, lnsShare: 0, clock });
  if (solved.status !== 'solved') throw new Error('fixture roster is infeasible');
  const score = makeRosterScorer({ ...roster, rules: hidden });
  const rnd = seededRandom(seed * 7919);
  const seats = roster.seats.map((s) => s.id);
  const startOf = new Map(roster.shifts.map((s) => [s.id, Date.parse(`${s.start}Z`)]));
  const seatStart = new Map(roster.seats.map((s) => [s.id, startOf.get(s.shift)!]));
  const edits: SyntheticEdit[] = [];
  let current = solved.decoded.assignment;
  let currentScore = score(current).total;
  if (kind === 'single') {
    const skillOf = new Map(roster.seats.map((s) => [s.id, s.skill]));
    while (edits.length < count) {
      const order = [...seats].sort(() => rnd() - 0.5);
      let found: { kept: RosterAssignment; s: number } | null = null;
      for (const seat of order) {
        let best: RosterAssignment | null = null;
        let bestScore = currentScore + 1e-6;
        const consider = (trial: RosterAssignment) => {
          const s = score(trial).total;
          if (s > bestScore) {
            bestScore = s;
            best = trial;
          }
        };
        const need = skillOf.get(seat);
        const here = current[seat] ?? null;
        for (const person of [null, ...roster.people.filter((p) => need === null || p.skills.includes(need!)).map((p) => p.id)])
          if (here !== person) consider({ ...current, [seat]: person });
        for (const other of seats)
          if ((current[other] ?? null) !== here && Math.abs(seatStart.get(other)! - seatStart.get(seat)!) <= 2 * DAY_MS) consider({ ...current, [seat]: current[other] ?? null, [other]: here });
        if (best) {
          found = { kept: best, s: bestScore };
          break;
        }
      }
      if (!found) break; // a local optimum under the hidden weights: this coordinator would edit no more
      edits.push({ roster, kept: found.kept, proposed: current, gain: found.s - currentScore });
      current = found.kept;
      currentScore = found.s;
    }
    return edits;
  }
  // the stretches: whole roster, each day, or each run of seven days (by the shifts' start dates)
  const first = Math.min(...seatStart.values());
  const dayOf = (seat: string) => Math.floor((seatStart.get(seat)! - first) / DAY_MS);
  const days = Math.max(...seats.map(dayOf)) + 1;
  const span = kind === 'day' ? 1 : kind === 'week' ? 7 : days;
  const windows: string[][] = [];
  for (let d = 0; d + span <= days; d++) windows.push(seats.filter((s) => dayOf(s) >= d && dayOf(s) < d + span));
  const hiddenRoster = { ...roster, rules: hidden };
  let idle = 0;
  let calls = 0;
  const order = windows.map((_, i) => i).sort(() => rnd() - 0.5);
  for (let at = 0; edits.length < count && idle < windows.length; at = (at + 1) % order.length) {
    const free = new Set(windows[order[at]]);
    const pins = roster.seats.filter((s) => !free.has(s.id)).map((s) => ({ seat: s.id, person: current[s.id] ?? null }));
    const r = await solveRoster({ ...hiddenRoster, pins: [...roster.pins.filter((p) => free.has(p.seat)), ...pins] }, { timeLimitMs: kind === 'resolve' ? solveMs : 300, seed: seed + ++calls, start: current, lagrangianShare: 0, lnsShare: 0, clock });
    const kept = r.status === 'solved' ? r.decoded.assignment : null;
    const s = kept ? score(kept).total : -Infinity;
    if (kept && s > currentScore + 1e-6) {
      edits.push({ roster, kept, proposed: current, gain: s - currentScore });
      current = kept;
      currentScore = s;
      idle = 0;
    } else idle++;
    if (kind === 'resolve') break;
  }
  return edits;
}
