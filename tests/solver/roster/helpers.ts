/**
 * Test helpers: random filled rosters and a greedy builder that respects the hard rules.
 */
import type { Roster, RosterAssignment } from '../../../shared/roster/schema';
import { shiftFacts } from '../../../shared/roster/derive';
import { seededRandom } from '../../../shared/demo/make-roster';
import { makeRosterScorer, scoreRoster } from '../../../solver/roster/score-roster';
import type { CompiledRoster } from '../../../solver/roster/compile';

/**
 * A random value per seat, avoiding double booking most of the time so that the
 * assignments exercise the soft terms (a random assignment is nearly always infeasible).
 */
export function randomValues(compiled: CompiledRoster, seed: number, careful = true): Int32Array {
  const rnd = seededRandom(seed);
  const { domains, roster, facts } = compiled;
  const shiftIdx = new Map(roster.shifts.map((s, i) => [s.id, i]));
  const busy = new Map<number, number[]>(); // person → shift indices
  const x = new Int32Array(domains.length);
  domains.forEach((d, s) => {
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
  return x;
}

/**
 * Greedy roster: shifts in time order, each seat to the available person furthest below
 * their contracted hours who breaks no hard rule so far. A witness that a roster is feasible
 * (checked by scoreRoster, not trusted).
 */
export function greedyRoster(roster: Roster, seed = 1): RosterAssignment {
  const rnd = seededRandom(seed);
  const facts = shiftFacts(roster);
  const r = roster.rules;
  const shiftIdx = new Map(roster.shifts.map((s, i) => [s.id, i]));
  const personIdx = new Map(roster.people.map((p, i) => [p.id, i]));
  const cannot = new Set<string>();
  for (const w of roster.wishes)
    if (w.kind === 'cannot')
      for (const f of facts) if (w.shift === f.id || w.date === f.date) cannot.add(`${personIdx.get(w.person)}:${f.index}`);
  const worked: number[][] = roster.people.map(() => []);
  const minutes = roster.people.map(() => 0);
  const out: RosterAssignment = {};
  const order = roster.seats.map((_, s) => s).sort((a, b) => {
    const fa = facts[shiftIdx.get(roster.seats[a].shift)!];
    const fb = facts[shiftIdx.get(roster.seats[b].shift)!];
    // skilled seats first within a shift: they have fewer candidates
    return fa.startMs - fb.startMs || Number(roster.seats[b].skill !== null) - Number(roster.seats[a].skill !== null) || a - b;
  });
  for (const s of order) {
    const seat = roster.seats[s];
    const f = facts[shiftIdx.get(seat.shift)!];
    let best = -1;
    let bestKey = Infinity;
    roster.people.forEach((p, i) => {
      if (seat.skill !== null && !p.skills.includes(seat.skill)) return;
      if (cannot.has(`${i}:${f.index}`)) return;
      const mine = worked[i].map((k) => facts[k]);
      if (mine.some((o) => o.startMs < f.endMs && f.startMs < o.endMs)) return;
      if (mine.some((o) => f.startMs - o.endMs < r.minRest.hours * 3_600_000)) return;
      const inWindow = (len: number, pick: (x: typeof f) => boolean) => mine.filter((o) => o.day > f.day - len && pick(o)).length;
      if (inWindow(r.weeklyRest.days, () => true) + 1 > r.weeklyRest.maxShifts) return;
      if (mine.filter((o) => o.day > f.day - 7).reduce((m, o) => m + o.minutes, 0) + f.minutes > r.maxHoursPer7Days.hours * 60) return;
      if (inWindow(r.maxConsecutiveDays.days + 1, () => true) + 1 > r.maxConsecutiveDays.days) return;
      if (f.night && inWindow(r.maxNightsInRow.nights + 1, (o) => o.night) + 1 > r.maxNightsInRow.nights) return;
      for (const pr of roster.pairings)
        if (pr.never && (pr.a === p.id || pr.b === p.id)) {
          const other = pr.a === p.id ? pr.b : pr.a;
          if (roster.seats.some((t) => t.shift === seat.shift && out[t.id] === other)) return;
        }
      const key = minutes[i] / 60 / Math.max(1, p.contractedHoursPerWeek ?? 30) + rnd() * 0.01;
      if (key < bestKey) {
        bestKey = key;
        best = i;
      }
    });
    out[seat.id] = best < 0 ? null : roster.people[best].id;
    if (best >= 0) {
      worked[best].push(f.index);
      minutes[best] += f.minutes;
    }
  }
  return out;
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
