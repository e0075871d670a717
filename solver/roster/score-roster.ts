/**
 * The independent scorer: evaluates every rule, term, absence, wish and pairing of a roster
 * directly on the roster data for a filled roster (seat → person), without the compiled
 * model. It runs each catalogue module's `check` (rules/index.ts), which counts from who works
 * what. Tests assert it equals the model's score (tests/solver/roster/score-consistency.test.ts),
 * so a mistake in either the compiler or a check shows up as a disagreement.
 *
 * Rule meanings are documented in docs/roster-format.md; each soft violation costs
 * `weight` × units (the unit named per rule), each hard violation makes the roster infeasible.
 */
import { absenceBlocks, absenceCredits, describeShift, formatDay, periodDays, shiftFacts, type ShiftFacts } from '../../shared/roster/derive';
import type { Roster, RosterAssignment, RuleName, TermKind } from '../../shared/roster/schema';
import { addLocalDays } from '../../shared/roster/time';
import { RULES, TERMS } from './rules';
import type { CheckContext, Worked } from './rules/types';
import { TERM_NAMES, type TermName } from './term-names';

export { TERM_NAMES, type TermName };

export type RosterViolation = {
  term: TermName;
  hard: boolean;
  /** Points this costs: negative for soft, -Infinity for hard. */
  points: number;
  /** In words, naming the person(s), e.g. "Ada Brook: 9 h rest between …; minimum 11 h". */
  message: string;
  people: string[];
  seats: string[];
};

export type RosterScore = {
  /** Sum of all soft points; -Infinity when any hard rule is broken. */
  total: number;
  feasible: boolean;
  /** Sum of the soft points even when infeasible (what the roster would score without its hard violations). */
  softTotal: number;
  /** Soft points per term (wishes and pairings may be positive). */
  terms: Record<TermName, number>;
  /** Hard violations per term. */
  hardCounts: Record<TermName, number>;
  /** Every soft penalty and every hard violation, in words. */
  violations: RosterViolation[];
};

/** Score a filled roster (seat id → person id; null or absent = open). */
export function scoreRoster(roster: Roster, assignment: RosterAssignment): RosterScore {
  return makeRosterScorer(roster)(assignment);
}

type Prepared = {
  facts: ShiftFacts[];
  shiftIdx: Map<string, number>;
  personIdx: Map<string, number>;
  seatIdx: Map<string, number>;
  days: number;
  credits: Float64Array[];
  away: ReturnType<typeof absenceBlocks>;
  seatsOfShift: number[][];
  memo: Map<string, unknown>;
};

/**
 * A scorer for many fillings of one roster (a coordinator's edits, brute force in tests):
 * the time-zone arithmetic and fair shares are done once. The roster must not change after.
 */
export function makeRosterScorer(roster: Roster): (assignment: RosterAssignment) => RosterScore {
  const facts = shiftFacts(roster);
  const shiftIdx = new Map(roster.shifts.map((s, i) => [s.id, i]));
  const seatsOfShift: number[][] = roster.shifts.map(() => []);
  roster.seats.forEach((seat, s) => seatsOfShift[shiftIdx.get(seat.shift)!].push(s));
  const prep: Prepared = {
    facts,
    shiftIdx,
    personIdx: new Map(roster.people.map((p, i) => [p.id, i])),
    seatIdx: new Map(roster.seats.map((s, i) => [s.id, i])),
    days: periodDays(roster),
    credits: absenceCredits(roster),
    away: absenceBlocks(roster, facts),
    seatsOfShift,
    memo: new Map(),
  };
  return (assignment) => scoreWith(roster, assignment, prep);
}

function scoreWith(roster: Roster, assignment: RosterAssignment, prep: Prepared): RosterScore {
  const { facts, shiftIdx, personIdx, seatIdx, days } = prep;
  const rules = roster.rules;

  const terms = Object.fromEntries(TERM_NAMES.map((t) => [t, 0])) as Record<TermName, number>;
  const hardCounts = Object.fromEntries(TERM_NAMES.map((t) => [t, 0])) as Record<TermName, number>;
  const violations: RosterViolation[] = [];
  const name = (p: number) => roster.people[p].name;
  const skillNames = new Map(roster.skills.map((k) => [k.id, k.name]));
  const sk = (id: string) => skillNames.get(id) ?? id;
  const hit = (term: TermName, hard: boolean, points: number, message: string, people: number[], seats: number[]) => {
    if (hard) hardCounts[term]++;
    else terms[term] += points;
    violations.push({
      term,
      hard,
      points: hard ? -Infinity : points,
      message,
      people: people.map((p) => roster.people[p].id),
      seats: seats.map((s) => roster.seats[s].id),
    });
  };
  const on = (term: RuleName) => rules[term].enabled && (rules[term].hard || rules[term].weight > 0);

  for (const seatId of Object.keys(assignment)) {
    if (!seatIdx.has(seatId)) hit('unknown', true, -Infinity, `unknown seat "${seatId}"`, [], []);
  }

  // who sits where
  const holder: number[] = roster.seats.map((seat) => {
    const pid = assignment[seat.id];
    if (pid === null || pid === undefined) return -1;
    const p = personIdx.get(pid);
    if (p === undefined) {
      hit('unknown', true, -Infinity, `unknown person "${pid}" in seat "${seat.id}"`, [], []);
      return -1;
    }
    return p;
  });
  const worked: Worked[][] = roster.people.map(() => []);
  holder.forEach((p, s) => {
    if (p >= 0) worked[p].push({ seat: s, shift: facts[shiftIdx.get(roster.seats[s].shift)!] });
  });
  for (const list of worked) list.sort((a, b) => a.shift.startMs - b.shift.startMs || a.seat - b.seat);

  // skills and pins (always hard)
  roster.seats.forEach((seat, s) => {
    const p = holder[s];
    const f = facts[shiftIdx.get(seat.shift)!];
    if (p >= 0 && seat.skill !== null && !roster.people[p].skills.includes(seat.skill))
      hit('skills', true, -Infinity, `${name(p)} lacks ${sk(seat.skill)}, which a seat on ${describeShift(f)} needs`, [p], [s]);
  });
  for (const pin of roster.pins) {
    const s = seatIdx.get(pin.seat)!;
    const want = pin.person === null ? -1 : personIdx.get(pin.person)!;
    if (holder[s] !== want) {
      const f = facts[shiftIdx.get(roster.seats[s].shift)!];
      const what = want < 0 ? 'pinned open' : `pinned to ${name(want)}`;
      hit('pins', true, -Infinity, `a seat on ${describeShift(f)} is ${what} but holds ${holder[s] < 0 ? 'nobody' : name(holder[s])}`, holder[s] >= 0 ? [holder[s]] : [], [s]);
    }
  }

  // double booking and absences (always hard)
  worked.forEach((list, p) => {
    for (let i = 0; i < list.length; i++) {
      const a = list[i].shift;
      const absence = prep.away.get(p)?.get(a.index);
      if (absence) hit('absences', true, -Infinity, `${name(p)} is on ${absence.kind === 'other' ? 'leave' : `${absence.kind} leave`} (${absence.start.replace('T', ' ')} to ${absence.end.replace('T', ' ')}) but works ${describeShift(a)}`, [p], [list[i].seat]);
      for (let j = i + 1; j < list.length; j++) {
        const b = list[j].shift;
        if (a.startMs < b.endMs && b.startMs < a.endMs) {
          const what = a.index === b.index ? `two seats on ${describeShift(a)}` : `${describeShift(a)} and ${describeShift(b)}, which overlap`;
          hit('doubleBooking', true, -Infinity, `${name(p)} is on ${what}`, [p], [list[i].seat, list[j].seat]);
        }
      }
    }
  });

  const ctx: CheckContext = {
    roster,
    facts,
    days,
    credits: prep.credits,
    worked,
    holder,
    seatsOfShift: prep.seatsOfShift,
    name,
    skillName: sk,
    range: (a, b) => `${formatDay(addLocalDays(roster.period.start, a))}–${formatDay(addLocalDays(roster.period.start, b))}`,
    on,
    breach: (term, hard, weight, units, message, people, seats) => hit(term, hard, -weight * units, message, people, seats),
    memo: <T>(key: string, make: () => T): T => {
      if (!prep.memo.has(key)) prep.memo.set(key, make());
      return prep.memo.get(key) as T;
    },
  };
  for (const m of RULES) if (on(m.id)) (m.check as (c: CheckContext, s: unknown) => void)(ctx, rules[m.id]);
  roster.people.forEach((person, p) =>
    person.terms.forEach((t, i) => {
      if (!t.hard && t.weight === 0) return;
      const m = TERMS[t.kind as TermKind];
      if (m.check) (m.check as (c: CheckContext, p: number, t: unknown, i: number) => void)(ctx, p, t, i);
    }),
  );

  // wishes: a shift wish applies to that shift, a date wish to every shift starting that day
  for (const w of roster.wishes) {
    const p = personIdx.get(w.person)!;
    for (const x of worked[p]) {
      const applies = w.shift !== undefined ? x.shift.id === w.shift : x.shift.date === w.date;
      if (!applies) continue;
      if (w.kind === 'cannot') hit('wishes', true, -Infinity, `${name(p)} cannot work ${w.shift !== undefined ? describeShift(x.shift) : `on ${formatDay(w.date!)}`} but is on ${describeShift(x.shift)}`, [p], [x.seat]);
      else if (w.kind === 'prefer') terms.wishes += w.strength;
      else if (w.strength > 0) hit('wishes', false, -w.strength, `${name(p)} asked to avoid ${w.shift !== undefined ? describeShift(x.shift) : formatDay(w.date!)} and is on ${describeShift(x.shift)}`, [p], [x.seat]);
    }
  }

  // pairings: once per shift both work
  if (roster.pairings.length) {
    const peopleOnShift: Set<number>[] = roster.shifts.map(() => new Set());
    holder.forEach((p, s) => {
      if (p >= 0) peopleOnShift[shiftIdx.get(roster.seats[s].shift)!].add(p);
    });
    for (const pr of roster.pairings) {
      const a = personIdx.get(pr.a)!;
      const b = personIdx.get(pr.b)!;
      peopleOnShift.forEach((on, i) => {
        if (!on.has(a) || !on.has(b)) return;
        if (pr.never) hit('pairings', true, -Infinity, `${name(a)} and ${name(b)} must never share a shift and both work ${describeShift(facts[i])}`, [a, b], []);
        else if (pr.score < 0) hit('pairings', false, pr.score, `${name(a)} and ${name(b)} both work ${describeShift(facts[i])}; they are better apart (${pr.score} points)`, [a, b], []);
        else terms.pairings += pr.score;
      });
    }
  }

  const softTotal = TERM_NAMES.reduce((m, t) => m + terms[t], 0);
  const feasible = TERM_NAMES.every((t) => hardCounts[t] === 0);
  return { total: feasible ? softTotal : -Infinity, feasible, softTotal, terms, hardCounts, violations };
}
