/**
 * Roster → model. One variable per seat; its values are the people who may sit there
 * (skill, `cannot` wishes and hard night-length removed, or just the pinned value) plus
 * `open`; `keys` = person index, -1 for open, so structured factors compare people across
 * seats. Factors (ids "<term>:<detail>", term as in score-roster.ts):
 *
 * - unary: coverage (open-seat penalty), prefer/avoid wishes, night shift length (soft);
 *   hard exclusions shrink domains instead of adding -Infinity entries;
 * - allDifferent: seats of one shift, of two overlapping shifts, and of two shifts too
 *   close for a hard minimum rest (O(K) messages, never a K×K table);
 * - sameKey: soft minimum rest between seats of two shifts (Potts over keys);
 * - counting over a shift's seats for each pairing (how many of the two are on it; score at 2);
 * - counting: per person and rolling window (weekly rest, hours per 7 days, consecutive days,
 *   nights in a row), per person over the period (contracted hours, fair nights/weekends),
 *   per shift (skill mix). Hours are counted in integer units of the greatest common divisor
 *   of shift lengths in minutes, so the sums stay small (8 h shifts → one unit each).
 *
 * The model's score of any assignment equals scoreRoster's total for the decoded roster;
 * tests check it on random rosters.
 */
import type { AllDifferentFactor, CountingFactor, Factor, Model, SameKeyFactor, UnaryFactor, Variable } from '../model';
import { factorScore } from '../model';
import {
  contractedTarget,
  describeShift,
  fairShares,
  periodDays,
  rollingWindows,
  shiftFacts,
  type ShiftFacts,
} from '../../shared/roster/derive';
import type { Roster, RuleName } from '../../shared/roster/schema';
import { TERM_NAMES, type TermName } from './score-roster';

export const OPEN = -1;

export type CompiledRoster = {
  roster: Roster;
  model: Model;
  facts: ShiftFacts[];
  /** seat id → variable index (every seat has one). */
  seatIndex: Map<string, number>;
  /** variable index → seat index in roster.seats (the same: variables follow roster.seats order). */
  seatIds: string[];
  /** variable → person index per value (-1 = open): the variable's keys. */
  domains: number[][];
  personIndex: Map<string, number>;
  /** Score parts that do not depend on the assignment (e.g. contracted hours of someone who can take no seat). */
  termConstants: Record<TermName, number>;
  /** Minutes per unit of hour-weights in counting factors. */
  minuteUnit: number;
  /**
   * Factors that carry several terms (identical counting factors merged, e.g. weekly rest and
   * the 48 h limit when all shifts have one length): factor index → each term's own table.
   */
  parts: ({ term: TermName; table: Float64Array }[] | undefined)[];
};

function gcd(a: number, b: number): number {
  while (b) [a, b] = [b, a % b];
  return a;
}

/** Term a factor belongs to, from its id prefix. */
export function termOf(f: Factor): TermName {
  return (f.id ?? '').split(':')[0] as TermName;
}

export function compileRoster(roster: Roster): CompiledRoster {
  const rules = roster.rules;
  const on = (t: RuleName) => rules[t].enabled && (rules[t].hard || rules[t].weight > 0);
  const facts = shiftFacts(roster);
  const days = periodDays(roster);
  const shiftIdx = new Map(roster.shifts.map((s, i) => [s.id, i]));
  const personIndex = new Map(roster.people.map((p, i) => [p.id, i]));
  const seatIndex = new Map(roster.seats.map((s, i) => [s.id, i]));
  const seatShift = roster.seats.map((s) => shiftIdx.get(s.shift)!);
  const seatsOfShift: number[][] = roster.shifts.map(() => []);
  seatShift.forEach((sh, s) => seatsOfShift[sh].push(s));
  const pinOf = new Map(roster.pins.map((p) => [p.seat, p.person === null ? OPEN : personIndex.get(p.person)!]));
  const factors: Factor[] = [];
  const termConstants = Object.fromEntries(TERM_NAMES.map((t) => [t, 0])) as Record<TermName, number>;

  // wishes per (person, shift): cannot, and net prefer/avoid points
  const cannot = new Set<string>();
  const wishPoints = new Map<string, number>();
  const shiftsOnDate = new Map<string, number[]>();
  facts.forEach((f) => shiftsOnDate.set(f.date, [...(shiftsOnDate.get(f.date) ?? []), f.index]));
  for (const w of roster.wishes) {
    const p = personIndex.get(w.person)!;
    const targets = w.shift !== undefined ? [shiftIdx.get(w.shift)!] : (shiftsOnDate.get(w.date!) ?? []);
    for (const sh of targets) {
      const key = `${p}:${sh}`;
      if (w.kind === 'cannot') cannot.add(key);
      else wishPoints.set(key, (wishPoints.get(key) ?? 0) + (w.kind === 'prefer' ? w.strength : -w.strength));
    }
  }
  const longNight = (f: ShiftFacts) => on('nightShiftLength') && f.night && f.minutes > rules.nightShiftLength.hours * 60;

  // domains
  const domains: number[][] = [];
  const hardUnary: { v: number; term: TermName; bad: Set<number> }[] = [];
  roster.seats.forEach((seat, s) => {
    const f = facts[seatShift[s]];
    const pinned = pinOf.get(seat.id);
    const excluded = (p: number): TermName | null => {
      if (cannot.has(`${p}:${f.index}`)) return 'wishes';
      if (longNight(f) && rules.nightShiftLength.hard) return 'nightShiftLength';
      return null;
    };
    let values: number[];
    if (pinned !== undefined) {
      values = [pinned];
      // a pin keeps its value even when a hard rule forbids it: the model then says infeasible, as the scorer does
      if (pinned !== OPEN) {
        const why = excluded(pinned);
        if (why) hardUnary.push({ v: s, term: why, bad: new Set([0]) });
      }
    } else {
      const people: number[] = [];
      roster.people.forEach((p, i) => {
        if ((seat.skill === null || p.skills.includes(seat.skill)) && excluded(i) === null) people.push(i);
      });
      const openAllowed = !(on('coverage') && rules.coverage.hard) || people.length === 0;
      values = openAllowed ? [...people, OPEN] : people;
    }
    if (on('coverage') && rules.coverage.hard) {
      const o = values.indexOf(OPEN);
      if (o >= 0) hardUnary.push({ v: s, term: 'coverage', bad: new Set([o]) });
    }
    domains.push(values);
  });

  const variables: Variable[] = roster.seats.map((seat, s) => ({
    name: seat.id,
    cardinality: domains[s].length,
    labels: domains[s].map((p) => (p === OPEN ? 'open' : roster.people[p].name)),
    keys: Int32Array.from(domains[s]),
  }));
  // value index of person p in seat s, or -1: flat arrays, looked up millions of times on large rosters
  const nPeople = roster.people.length;
  const valueTable = new Int32Array(domains.length * nPeople).fill(-1);
  domains.forEach((d, s) => d.forEach((p, x) => p !== OPEN && (valueTable[s * nPeople + p] = x)));
  const valueAt = (s: number, p: number): number => valueTable[s * nPeople + p];

  for (const h of hardUnary) {
    const table = new Float64Array(domains[h.v].length);
    for (const x of h.bad) table[x] = -Infinity;
    factors.push({ kind: 'unary', v: h.v, table, hard: true, id: `${h.term}:hard:${roster.seats[h.v].id}`, label: `${h.term} (hard) on ${roster.seats[h.v].id}` } satisfies UnaryFactor);
  }

  // soft unaries: coverage, wishes, night length
  roster.seats.forEach((seat, s) => {
    const f = facts[seatShift[s]];
    const d = domains[s];
    if (on('coverage') && !rules.coverage.hard && d.includes(OPEN)) {
      const table = new Float64Array(d.length);
      table[d.indexOf(OPEN)] = -rules.coverage.weight;
      factors.push({ kind: 'unary', v: s, table, id: `coverage:${seat.id}`, label: `open seat on ${describeShift(f)}` });
    }
    const wt = new Float64Array(d.length);
    let anyWish = false;
    d.forEach((p, x) => {
      const pts = p === OPEN ? undefined : wishPoints.get(`${p}:${f.index}`);
      if (pts) {
        wt[x] = pts;
        anyWish = true;
      }
    });
    if (anyWish) factors.push({ kind: 'unary', v: s, table: wt, id: `wishes:${seat.id}`, label: `wishes for ${describeShift(f)}` });
    if (longNight(f) && !rules.nightShiftLength.hard) {
      const table = new Float64Array(d.length);
      d.forEach((p, x) => {
        if (p !== OPEN) table[x] = -rules.nightShiftLength.weight;
      });
      factors.push({ kind: 'unary', v: s, table, id: `nightShiftLength:${seat.id}`, label: `night longer than ${rules.nightShiftLength.hours} h on ${describeShift(f)}` });
    }
  });

  // double booking and minimum rest between pairs of shifts
  const byStart = facts.map((f) => f.index).sort((a, b) => facts[a].startMs - facts[b].startMs || a - b);
  const restMs = on('minRest') ? rules.minRest.hours * 3_600_000 : 0;
  const shareSomeone = (a: number[], b: number[]) => {
    const s = new Set<number>();
    for (const v of a) for (const p of domains[v]) if (p !== OPEN) s.add(p);
    for (const v of b) for (const p of domains[v]) if (p !== OPEN && s.has(p)) return true;
    return false;
  };
  for (const sh of facts) {
    if (seatsOfShift[sh.index].length >= 2)
      factors.push({ kind: 'allDifferent', vars: seatsOfShift[sh.index], id: `doubleBooking:${sh.id}`, label: `one seat each on ${describeShift(sh)}` } satisfies AllDifferentFactor);
  }
  for (let i = 0; i < byStart.length; i++) {
    const A = facts[byStart[i]];
    for (let j = i + 1; j < byStart.length; j++) {
      const B = facts[byStart[j]];
      // sorted by start: once B starts a full rest after A ends, no later shift overlaps A or follows it too closely
      if (B.startMs >= A.endMs + restMs) break;
      const sa = seatsOfShift[A.index];
      const sb = seatsOfShift[B.index];
      if (!sa.length || !sb.length) continue;
      const [first, second] = A.endMs <= B.startMs ? [A, B] : B.endMs <= A.startMs ? [B, A] : [null, null];
      if (first === null || second === null) {
        if (shareSomeone(sa, sb))
          factors.push({ kind: 'allDifferent', vars: [...sa, ...sb], id: `doubleBooking:${A.id}:${B.id}`, label: `${describeShift(A)} overlaps ${describeShift(B)}` });
        continue;
      }
      const gap = Math.round((second.startMs - first.endMs) / 60_000);
      if (!on('minRest') || gap >= rules.minRest.hours * 60 || !shareSomeone(sa, sb)) continue;
      const label = `rest between ${describeShift(first)} and ${describeShift(second)}`;
      if (rules.minRest.hard) {
        factors.push({ kind: 'allDifferent', vars: [...sa, ...sb], id: `minRest:${first.id}:${second.id}`, label });
      } else {
        for (const a of sa)
          for (const b of sb)
            if (domains[a].some((p) => p !== OPEN && valueAt(b, p) >= 0))
              factors.push({ kind: 'sameKey', a, b, weight: -rules.minRest.weight, id: `minRest:${first.id}:${second.id}`, label } satisfies SameKeyFactor);
      }
    }
  }

  // pairings: one counting factor per shift and pairing, counting how many of the two are on
  // it; score at 2. One factor sees the whole shift, so a relaxation cannot claim the pairing
  // once per pair of seats (measured: seat-pair sparse tables left the demo's bound ~650 points loose).
  for (const pr of roster.pairings) {
    if (!pr.never && pr.score === 0) continue;
    const a = personIndex.get(pr.a)!;
    const b = personIndex.get(pr.b)!;
    const value = pr.never ? -Infinity : pr.score;
    for (const sh of facts) {
      const vars: number[] = [];
      const weights: [number, number][][] = [];
      let hasA = false;
      let hasB = false;
      for (const s of seatsOfShift[sh.index]) {
        const ws: [number, number][] = [];
        const xa = valueAt(s, a);
        const xb = valueAt(s, b);
        if (xa >= 0) ws.push([xa, 1]);
        if (xb >= 0) ws.push([xb, 1]);
        hasA ||= xa >= 0;
        hasB ||= xb >= 0;
        if (ws.length) {
          vars.push(s);
          weights.push(ws);
        }
      }
      if (!hasA || !hasB) continue;
      // sum 2 = both on the shift (a person holding two seats of one shift is already impossible)
      factors.push({
        kind: 'counting',
        vars,
        weights,
        score: [0, 0, value],
        hard: pr.never || undefined,
        id: `pairings:${pr.never ? 'never:' : ''}${pr.a}:${pr.b}:${sh.id}`,
        label: `${roster.people[a].name} and ${roster.people[b].name} ${pr.never ? 'never together' : 'together'} on ${describeShift(sh)}`,
      } satisfies CountingFactor);
    }
  }

  // counting factors
  let unit = 0;
  for (const f of facts) if (seatsOfShift[f.index].length) unit = gcd(unit, f.minutes);
  unit = Math.max(1, unit);

  // Hard weekly limits bound how much anyone can feasibly work in a span of days. Person-level
  // tables stop there (the model type repeats a table's last entry for larger sums), which
  // keeps the counting DPs small: sums past the cap break a hard factor anyway, so no
  // feasible score changes. Caps in shifts (count) and in weight units (minutes / unit).
  let maxShiftMinutes = 0;
  let minShiftMinutes = Infinity;
  for (const f of facts)
    if (seatsOfShift[f.index].length) {
      maxShiftMinutes = Math.max(maxShiftMinutes, f.minutes);
      minShiftMinutes = Math.min(minShiftMinutes, f.minutes);
    }
  const capFor = (spanDays: number, minutesWeighted: boolean): number => {
    let countCap = Infinity;
    let unitCap = Infinity;
    if (on('weeklyRest') && rules.weeklyRest.hard) countCap = Math.min(countCap, Math.ceil(spanDays / rules.weeklyRest.days) * rules.weeklyRest.maxShifts);
    if (on('maxHoursPer7Days') && rules.maxHoursPer7Days.hard) {
      const blocks = Math.ceil(spanDays / 7);
      countCap = Math.min(countCap, blocks * Math.floor((rules.maxHoursPer7Days.hours * 60) / minShiftMinutes));
      unitCap = Math.min(unitCap, blocks * Math.floor((rules.maxHoursPer7Days.hours * 60) / unit));
    }
    if (!minutesWeighted) return countCap;
    return Math.min(unitCap, countCap === Infinity ? Infinity : Math.ceil((countCap * maxShiftMinutes) / unit));
  };

  // [[x, w]] lists shared between factors: the same person in the same seat weighs the same in
  // every window (saves millions of tiny arrays on large rosters).
  const onesCache: ([number, number][] | undefined)[] = [];
  const weightList = (s: number, x: number, w: number): [number, number][] => {
    if (w !== 1) return [[x, w]];
    const key = s * (nPeople + 1) + x;
    return (onesCache[key] ??= [[x, 1]]);
  };

  /** Merged counting factors: same person, same vars and weights (e.g. weekly rest and 48 h with equal shifts). */
  const mergeable = new Map<string, number>();
  const parts: ({ term: TermName; table: Float64Array }[] | undefined)[] = [];

  /** Counting factor over the seats in `seats` that person p could take; score(sum) from `scoreAt`. */
  const personCount = (
    term: TermName,
    detail: string,
    label: string,
    p: number,
    seats: number[],
    weightOf: (s: number) => number,
    scoreAt: (sum: number) => number,
    hard: boolean,
    cap: number,
    mergeKey?: string,
  ) => {
    const vars: number[] = [];
    const weights: [number, number][][] = [];
    let maxSum = 0;
    let allOnes = true;
    for (const s of seats) {
      const x = valueAt(s, p);
      if (x < 0) continue;
      const w = weightOf(s);
      if (w === 0) continue;
      vars.push(s);
      weights.push(weightList(s, x, w));
      maxSum += w;
      if (w !== 1) allOnes = false;
    }
    let length = Math.min(maxSum, cap) + 1;
    let table = new Float64Array(length);
    let varies = false;
    for (let k = 0; k < length; k++) {
      table[k] = scoreAt(k);
      if (table[k] !== table[0]) varies = true;
    }
    // a constant tail is one entry (the type repeats the last entry): a hard limit of 6 stops at 7 entries
    while (length > 1 && table[length - 2] === table[length - 1]) length--;
    if (length < table.length) table = table.slice(0, length);
    if (vars.length === 0 || !varies) {
      termConstants[term] += table[0];
      return;
    }
    const key = mergeKey !== undefined && allOnes ? `${mergeKey}:${hard}:${vars.length}:${length}` : undefined;
    const at = key !== undefined ? mergeable.get(key) : undefined;
    if (at !== undefined) {
      const f = factors[at] as CountingFactor;
      const t = f.score as Float64Array;
      for (let k = 0; k < length; k++) t[k] += table[k];
      parts[at]!.push({ term, table });
      f.id = `${termOf(f)}+${term}:${detail}`;
      f.label = `${f.label}; ${label}`;
      return;
    }
    if (key !== undefined) {
      mergeable.set(key, factors.length);
      parts[factors.length] = [{ term, table: Float64Array.from(table) }];
    }
    factors.push({ kind: 'counting', vars, weights, score: table, hard: hard || undefined, id: `${term}:${detail}`, label } satisfies CountingFactor);
  };
  const overPenalty = (term: RuleName, limit: number, toUnits: (sum: number) => number) => (sum: number) => {
    const over = toUnits(sum) - limit;
    return over > 0 ? (rules[term].hard ? -Infinity : -rules[term].weight * over) : 0;
  };
  const minutesW = (s: number) => facts[seatShift[s]].minutes / unit;
  const one = () => 1;

  const windowRule = (term: 'weeklyRest' | 'maxHoursPer7Days' | 'maxConsecutiveDays' | 'maxNightsInRow', length: number, pick: (f: ShiftFacts) => boolean, weightOf: (s: number) => number, limit: number, toUnits: (sum: number) => number, nightsOnly: boolean) => {
    if (!on(term)) return;
    const minutesWeighted = term === 'maxHoursPer7Days';
    for (const w of rollingWindows(days, length)) {
      const seats: number[] = [];
      for (let s = 0; s < roster.seats.length; s++) {
        const f = facts[seatShift[s]];
        if (f.day >= w.first && f.day <= w.last && pick(f)) seats.push(s);
      }
      // the two rules that give the caps are never capped themselves (that would be circular)
      const cap = term === 'weeklyRest' || term === 'maxHoursPer7Days' ? Infinity : capFor(w.last - w.first + 1, minutesWeighted);
      roster.people.forEach((person, p) =>
        personCount(term, `${person.id}:${w.first}`, `${term} for ${person.name} from day ${w.first + 1}`, p, seats, weightOf, overPenalty(term, limit, toUnits), rules[term].hard, cap, `${w.first}:${w.last}:${nightsOnly}:${p}`),
      );
    }
  };
  const ident = (k: number) => k;
  windowRule('weeklyRest', rules.weeklyRest.days, () => true, one, rules.weeklyRest.maxShifts, ident, false);
  windowRule('maxHoursPer7Days', 7, () => true, minutesW, rules.maxHoursPer7Days.hours, (k) => (k * unit) / 60, false);
  windowRule('maxConsecutiveDays', rules.maxConsecutiveDays.days + 1, () => true, one, rules.maxConsecutiveDays.days, ident, false);
  windowRule('maxNightsInRow', rules.maxNightsInRow.nights + 1, (f) => f.night, one, rules.maxNightsInRow.nights, ident, true);

  const allSeats = roster.seats.map((_, s) => s);
  if (on('contractedHours')) {
    roster.people.forEach((person, p) => {
      const target = contractedTarget(person, days);
      if (target === undefined) return;
      const r = rules.contractedHours;
      personCount('contractedHours', person.id, `contracted hours of ${person.name}`, p, allSeats, minutesW, (k) => {
        const dev = Math.abs((k * unit) / 60 - target) - r.toleranceHours;
        return dev > 0 ? (r.hard ? -Infinity : -r.weight * dev) : 0;
      }, r.hard, capFor(days, true));
    });
  }
  const fair = (term: 'fairNights' | 'fairWeekends', pick: (f: ShiftFacts) => boolean) => {
    if (!on(term)) return;
    const seats = allSeats.filter((s) => pick(facts[seatShift[s]]));
    for (const [p, share] of fairShares(roster, facts, pick))
      personCount(term, roster.people[p].id, `${term} for ${roster.people[p].name}`, p, seats, one, overPenalty(term, share, ident), rules[term].hard, capFor(days, false));
  };
  fair('fairNights', (f) => f.night);
  fair('fairWeekends', (f) => f.weekend);

  if (on('skillMix')) {
    const r = rules.skillMix;
    r.requirements.forEach((q, qi) => {
      for (const f of facts) {
        if (q.patternLabel !== undefined && f.patternLabel !== q.patternLabel) continue;
        const short = (k: number) => (k < q.min ? (r.hard ? -Infinity : -r.weight * (q.min - k)) : 0);
        const vars: number[] = [];
        const weights: [number, number][][] = [];
        for (const s of seatsOfShift[f.index]) {
          const ws: [number, number][] = [];
          domains[s].forEach((p, x) => {
            if (p !== OPEN && roster.people[p].skills.includes(q.skill)) ws.push([x, 1]);
          });
          if (ws.length) {
            vars.push(s);
            weights.push(ws);
          }
        }
        if (!vars.length) {
          termConstants.skillMix += short(0);
          continue;
        }
        const table = new Float64Array(Math.min(vars.length, q.min) + 1);
        for (let k = 0; k < table.length; k++) table[k] = short(k);
        factors.push({ kind: 'counting', vars, weights, score: table, hard: r.hard || undefined, id: `skillMix:${qi}:${f.id}`, label: `${q.min} with ${q.skill} on ${describeShift(f)}` });
      }
    });
  }

  const constant = TERM_NAMES.reduce((m, t) => m + termConstants[t], 0);
  const model: Model = { variables, factors, constant, name: roster.name ?? 'roster' };
  return {
    roster,
    model,
    facts,
    seatIndex,
    seatIds: roster.seats.map((s) => s.id),
    domains,
    personIndex,
    termConstants,
    minuteUnit: unit,
    parts,
  };
}

/** The model's score split by term (same names as scoreRoster's terms), for a value assignment. */
export function modelTerms(compiled: CompiledRoster, x: ArrayLike<number>): Record<TermName, number> {
  const out = { ...compiled.termConstants };
  compiled.model.factors.forEach((f, i) => {
    const split = compiled.parts[i];
    if (split && f.kind === 'counting') {
      let sum = 0;
      f.vars.forEach((v, j) => {
        for (const [val, w] of f.weights[j]) if (val === x[v]) sum += w;
      });
      for (const p of split) out[p.term] += p.table[Math.min(sum, p.table.length - 1)];
    } else out[termOf(f)] += factorScore(compiled.model, f, x);
  });
  return out;
}
