/**
 * Test helpers: random filled rosters and a greedy builder that respects the hard rules.
 */
import type { Roster, RosterAssignment } from '../../../shared/roster/schema';
import { makeRoster, seededRandom, type MakeRosterOptions } from '../../../shared/demo/make-roster';
import { makeRosterScorer, scoreRoster } from '../../../solver/roster/score-roster';
import { bestAux, compileRoster, type CompiledRoster } from '../../../solver/roster/compile';
import { decodeAssignment } from '../../../solver/roster/decode';
import { greedyAssignment } from '../../../solver/roster/greedy';

/**
 * A random value per seat (aux variables then set by bestAux), avoiding double booking most of the time so that the
 * assignments exercise the soft terms (a random assignment is nearly always infeasible).
 */
export function randomValues(compiled: CompiledRoster, seed: number, careful = true): Int32Array {
  const rnd = seededRandom(seed);
  const { domains, roster, facts } = compiled;
  const shiftIdx = new Map(roster.shifts.map((s, i) => [s.id, i]));
  const busy = new Map<number, number[]>(); // person → shift indices
  const x = new Int32Array(compiled.model.variables.length);
  domains.slice(0, roster.seats.length).forEach((d, s) => {
    const f = facts[shiftIdx.get(roster.seats[s].shift)!];
    for (let tries = 0; tries < 6; tries++) {
      const v = Math.floor(rnd() * d.length);
      x[s] = v;
      const p = d[v];
      if (!careful || p < 0) break;
      const clash = (busy.get(p) ?? []).some((o) => facts[o].startMs < f.endMs && f.startMs < facts[o].endMs);
      if (!clash) break;
    }
    const p = d[x[s]];
    if (p >= 0) busy.set(p, [...(busy.get(p) ?? []), f.index]);
  });
  return bestAux(compiled, x);
}

/**
 * A filled roster from the solver's greedy start (solver/roster/greedy.ts), decoded. A witness
 * that a roster is feasible only after scoreRoster says so (the callers check; it is not trusted).
 */
export function greedyRoster(roster: Roster): RosterAssignment {
  const c = compileRoster(roster);
  return decodeAssignment(c, greedyAssignment(c)).assignment;
}

export function openCount(a: RosterAssignment): number {
  return Object.values(a).filter((v) => v === null).length;
}

export { scoreRoster };

/**
 * Best scoreRoster total over all (people + open)^seats fillings: the roster's own rules, not the
 * model. The outside check for small rosters (exact.test.ts, lagrangian.test.ts, highs-reference.test.ts).
 */
export function bruteForceBest(r: Roster): number {
  const options: (string | null)[] = [null, ...r.people.map((p) => p.id)];
  const n = r.seats.length;
  const digits = new Array(n).fill(0);
  let best = -Infinity;
  const score = makeRosterScorer(r);
  for (;;) {
    const a: RosterAssignment = {};
    r.seats.forEach((s, i) => (a[s.id] = options[digits[i]]));
    const t = score(a).total;
    if (t > best) best = t;
    let i = 0;
    while (i < n && ++digits[i] === options.length) digits[i++] = 0;
    if (i === n) return best;
  }
}

type Weekday = 'mon' | 'tue' | 'wed' | 'thu' | 'fri' | 'sat' | 'sun';

/**
 * Three people over at most one week from Mon 4 Jan 2027 (two wishes each, two pairings) with
 * the small tests' shifts: earlies on `earlyDays`, a Wednesday late with a medication seat, a
 * night on `nightDay`. `rules` draws from the seed's random numbers, which the caller gets back
 * to draw more (terms, a hard pairing) in the same sequence.
 */
export function smallWeekRoster(
  seed: number,
  rules: (rnd: () => number) => MakeRosterOptions['rules'],
  o: { end?: string; earlyDays?: Weekday[]; nightDay?: Weekday } = {},
): { roster: Roster; rnd: () => number } {
  const rnd = seededRandom(seed);
  const ruleSet = rules(rnd);
  const roster = makeRoster({
    people: 3,
    weeks: 1,
    seed,
    wishesPerPerson: 2,
    pairingCount: 2,
    period: { start: '2027-01-04', end: o.end ?? '2027-01-10', timeZone: 'Europe/London' },
    patterns: [
      { label: 'early', weekdays: o.earlyDays ?? ['mon', 'tue', 'thu', 'sat'], start: '07:00', end: '15:00', seats: [{ skill: null, count: 1 }] },
      { label: 'late', weekdays: ['wed'], start: '15:00', end: '23:00', seats: [{ skill: 'medication', count: 1 }, { skill: null, count: 1 }] },
      { label: 'night', weekdays: [o.nightDay ?? 'mon'], start: '22:00', end: '07:00', seats: [{ skill: null, count: 1 }] },
    ],
    rules: ruleSet,
  });
  return { roster, rnd };
}

/** With the first pairing made a hard "never" on every third seed. */
export function withNeverPairing(r: Roster, seed: number): Roster {
  if (seed % 3 === 0 && r.pairings.length) r.pairings[0] = { ...r.pairings[0]!, never: true };
  return r;
}

/** The Lagrangian tests' small roster (lagrangian.test.ts, bundle.test.ts): 3 people, 7 days, 7 seats; every rule kind on, soft rest in half the seeds (sameKey factors), pairings incl. hard "never". */
export function lagrangianRoster(seed: number): Roster {
  const { roster } = smallWeekRoster(seed, (rnd) => ({
    coverage: { weight: 2 + Math.floor(rnd() * 6), hard: rnd() < 0.2 },
    minRest: { hard: seed % 2 === 0, weight: 3 },
    // weeklyRest (Art. 5) adds rest-choice variables (compile.ts AuxVariable): tested on its own below
    weeklyRest: { enabled: false },
    shiftsPerWindow: { enabled: true, days: 3, maxShifts: 2, hard: rnd() < 0.5, weight: 2 },
    maxConsecutiveDays: { days: 2, weight: 2 },
    maxNightsInRow: { nights: 1, weight: 2 },
    maxHoursPer7Days: { hours: 24, hard: rnd() < 0.5, weight: 1 },
    contractedHours: { toleranceHours: 4, weight: 0.5 },
    fairNights: { weight: 1 },
    fairWeekends: { weight: 2 },
    skillMix: { requirements: [{ skill: 'first-aid', min: 1 }], weight: 2 },
  }));
  return withNeverPairing(roster, seed);
}
