/**
 * The independent scorer: evaluates every rule, wish and pairing of a roster directly on
 * the roster data for a filled roster (seat → person), without the compiled model. Tests
 * assert it equals the model's score (tests/solver/roster/score-consistency.test.ts), so a
 * mistake in either the compiler or this file shows up as a disagreement.
 *
 * Rule meanings are documented in docs/roster-format.md; each soft violation costs
 * `weight` × units (the unit named per rule), each hard violation makes the roster infeasible.
 */
import {
  contractedTarget,
  describeShift,
  fairShares,
  formatDay,
  formatHours,
  periodDays,
  rollingWindows,
  shiftFacts,
  type ShiftFacts,
} from '../../shared/roster/derive';
import { RULE_NAMES, type Roster, type RosterAssignment, type RuleName } from '../../shared/roster/schema';
import { addLocalDays } from '../../shared/roster/time';

/** A score term: each rule, plus the parts that are not rules. */
export type TermName =
  | RuleName
  | 'wishes'
  | 'pairings'
  /** Always hard: a person on two overlapping shifts (or two seats of one shift). */
  | 'doubleBooking'
  /** Always hard: a person without the seat's skill. */
  | 'skills'
  /** Always hard: a pinned seat holding someone else. */
  | 'pins'
  /** Always hard: the filled roster names a seat or person the roster does not have. */
  | 'unknown';

export const TERM_NAMES: readonly TermName[] = [...RULE_NAMES, 'wishes', 'pairings', 'doubleBooking', 'skills', 'pins', 'unknown'];

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

type Worked = { seat: number; shift: ShiftFacts };

/** Score a filled roster (seat id → person id; null or absent = open). */
export function scoreRoster(roster: Roster, assignment: RosterAssignment): RosterScore {
  return makeRosterScorer(roster)(assignment);
}

/**
 * A scorer for many fillings of one roster (a coordinator's edits, brute force in tests):
 * the time-zone arithmetic and fair shares are done once. The roster must not change after.
 */
export function makeRosterScorer(roster: Roster): (assignment: RosterAssignment) => RosterScore {
  const facts = shiftFacts(roster);
  const shiftIdx = new Map(roster.shifts.map((s, i) => [s.id, i]));
  const personIdx = new Map(roster.people.map((p, i) => [p.id, i]));
  const seatIdx = new Map(roster.seats.map((s, i) => [s.id, i]));
  const rules = roster.rules;
  const days = periodDays(roster);
  const nightShares = fairShares(roster, facts, (f) => f.night);
  const weekendShares = fairShares(roster, facts, (f) => f.weekend);
  return (assignment) => scoreWith(roster, assignment, { facts, shiftIdx, personIdx, seatIdx, days, nightShares, weekendShares });
}

type Prepared = {
  facts: ShiftFacts[];
  shiftIdx: Map<string, number>;
  personIdx: Map<string, number>;
  seatIdx: Map<string, number>;
  days: number;
  nightShares: Map<number, number>;
  weekendShares: Map<number, number>;
};

function scoreWith(roster: Roster, assignment: RosterAssignment, prep: Prepared): RosterScore {
  const { facts, shiftIdx, personIdx, seatIdx, days } = prep;
  const rules = roster.rules;

  const terms = Object.fromEntries(TERM_NAMES.map((t) => [t, 0])) as Record<TermName, number>;
  const hardCounts = Object.fromEntries(TERM_NAMES.map((t) => [t, 0])) as Record<TermName, number>;
  const violations: RosterViolation[] = [];
  const name = (p: number) => roster.people[p].name;
  const skillName = new Map(roster.skills.map((k) => [k.id, k.name]));
  const sk = (id: string) => skillName.get(id) ?? id;
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
  /** A soft or hard breach of a rule: soft costs weight × units. */
  const breach = (term: RuleName, units: number, message: string, people: number[], seats: number[]) => {
    const r = rules[term];
    hit(term, r.hard, -r.weight * units, message, people, seats);
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

  // coverage
  if (on('coverage')) {
    holder.forEach((p, s) => {
      if (p < 0) {
        const seat = roster.seats[s];
        const f = facts[shiftIdx.get(seat.shift)!];
        breach('coverage', 1, `a ${seat.skill ? `${sk(seat.skill)} ` : ''}seat on ${describeShift(f)} is open`, [], [s]);
      }
    });
  }

  // per person: double booking, rest, night length
  worked.forEach((list, p) => {
    for (let i = 0; i < list.length; i++) {
      for (let j = i + 1; j < list.length; j++) {
        const a = list[i].shift;
        const b = list[j].shift;
        if (a.startMs < b.endMs && b.startMs < a.endMs) {
          const what = a.index === b.index ? `two seats on ${describeShift(a)}` : `${describeShift(a)} and ${describeShift(b)}, which overlap`;
          hit('doubleBooking', true, -Infinity, `${name(p)} is on ${what}`, [p], [list[i].seat, list[j].seat]);
          continue;
        }
        const [first, second] = a.endMs <= b.startMs ? [a, b] : [b, a];
        const gapMinutes = Math.round((second.startMs - first.endMs) / 60_000);
        if (on('minRest') && gapMinutes < rules.minRest.hours * 60)
          breach(
            'minRest',
            1,
            `${name(p)}: ${formatHours(gapMinutes / 60)} rest between ${describeShift(first)} and ${describeShift(second)}; minimum ${formatHours(rules.minRest.hours)}`,
            [p],
            [list[i].seat, list[j].seat],
          );
      }
      const f = list[i].shift;
      if (on('nightShiftLength') && f.night && f.minutes > rules.nightShiftLength.hours * 60)
        breach('nightShiftLength', 1, `${name(p)} works ${describeShift(f)}, a ${formatHours(f.hours)} night; at most ${formatHours(rules.nightShiftLength.hours)}`, [p], [list[i].seat]);
    }
  });

  // rolling windows, counted by the day a shift starts
  const windowRule = (
    term: 'weeklyRest' | 'maxHoursPer7Days' | 'maxConsecutiveDays' | 'maxNightsInRow',
    length: number,
    pickShift: (f: ShiftFacts) => boolean,
    measure: (ws: Worked[]) => number,
    limit: number,
    words: (p: number, value: number, first: string, last: string) => string,
  ) => {
    if (!on(term)) return;
    for (const w of rollingWindows(days, length)) {
      worked.forEach((list, p) => {
        const inside = list.filter((x) => x.shift.day >= w.first && x.shift.day <= w.last && pickShift(x.shift));
        if (inside.length === 0) return;
        const value = measure(inside);
        const over = value - limit;
        if (over > 0) {
          breach(term, over, words(p, value, addLocalDays(roster.period.start, w.first), addLocalDays(roster.period.start, w.last)), [p], inside.map((x) => x.seat));
        }
      });
    }
  };
  const range = (a: string, b: string) => `${formatDay(a)}–${formatDay(b)}`;
  windowRule(
    'weeklyRest',
    rules.weeklyRest.days,
    () => true,
    (ws) => ws.length,
    rules.weeklyRest.maxShifts,
    (p, v, a, b) => `${name(p)}: ${v} shifts in the ${rules.weeklyRest.days} days ${range(a, b)}, no day for the weekly rest; at most ${rules.weeklyRest.maxShifts}`,
  );
  windowRule(
    'maxHoursPer7Days',
    7,
    () => true,
    (ws) => ws.reduce((m, x) => m + x.shift.minutes, 0) / 60,
    rules.maxHoursPer7Days.hours,
    (p, v, a, b) => `${name(p)}: ${formatHours(v)} in the 7 days ${range(a, b)}; at most ${formatHours(rules.maxHoursPer7Days.hours)}`,
  );
  windowRule(
    'maxConsecutiveDays',
    rules.maxConsecutiveDays.days + 1,
    () => true,
    (ws) => ws.length,
    rules.maxConsecutiveDays.days,
    (p, v, a, b) => `${name(p)}: ${v} shifts on the ${rules.maxConsecutiveDays.days + 1} days ${range(a, b)}; at most ${rules.maxConsecutiveDays.days} days in a row`,
  );
  windowRule(
    'maxNightsInRow',
    rules.maxNightsInRow.nights + 1,
    (f) => f.night,
    (ws) => ws.length,
    rules.maxNightsInRow.nights,
    (p, v, a, b) => `${name(p)}: ${v} nights on the ${rules.maxNightsInRow.nights + 1} days ${range(a, b)}; at most ${rules.maxNightsInRow.nights} in a row`,
  );

  // contracted hours over the period
  if (on('contractedHours')) {
    roster.people.forEach((person, p) => {
      const target = contractedTarget(person, days);
      if (target === undefined) return;
      const hours = worked[p].reduce((m, x) => m + x.shift.minutes, 0) / 60;
      const dev = Math.abs(hours - target) - rules.contractedHours.toleranceHours;
      if (dev > 0)
        breach(
          'contractedHours',
          dev,
          `${name(p)}: ${formatHours(hours)} over the period against ${formatHours(target)} contracted (± ${formatHours(rules.contractedHours.toleranceHours)})`,
          [p],
          worked[p].map((x) => x.seat),
        );
    });
  }

  // fair spread of nights and weekends
  const fair = (term: 'fairNights' | 'fairWeekends', pickShift: (f: ShiftFacts) => boolean, noun: string) => {
    if (!on(term)) return;
    const shares = term === 'fairNights' ? prep.nightShares : prep.weekendShares;
    for (const [p, share] of shares) {
      const mine = worked[p].filter((x) => pickShift(x.shift));
      const over = mine.length - share;
      if (over > 0) breach(term, over, `${name(p)}: ${mine.length} ${noun}; fair share is ${share}`, [p], mine.map((x) => x.seat));
    }
  };
  fair('fairNights', (f) => f.night, 'night shifts');
  fair('fairWeekends', (f) => f.weekend, 'weekend shifts');

  // skill mix per shift
  if (on('skillMix')) {
    const seatsOfShift: number[][] = roster.shifts.map(() => []);
    roster.seats.forEach((seat, s) => seatsOfShift[shiftIdx.get(seat.shift)!].push(s));
    for (const q of rules.skillMix.requirements) {
      facts.forEach((f, i) => {
        if (q.patternLabel !== undefined && f.patternLabel !== q.patternLabel) return;
        const have = seatsOfShift[i].filter((s) => holder[s] >= 0 && roster.people[holder[s]].skills.includes(q.skill)).length;
        if (have < q.min) breach('skillMix', q.min - have, `${describeShift(f)} has ${have} with ${sk(q.skill)}; at least ${q.min}`, [], seatsOfShift[i]);
      });
    }
  }

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
