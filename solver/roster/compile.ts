/**
 * Roster → model: a small driver around the rule catalogue (rules/index.ts). It builds the
 * seat variables and the context (domains, seat indexes, personCount, credits), then runs
 * every rule's and every per-person term's compile. Factor ids are "<term>:<detail>" with
 * term = the rule id (or term kind), which explanations and the Lagrangian bound key off.
 *
 * Variables: one per seat (values: the people who may sit there plus `open`; `keys` = person
 * index, -1 for open), then the auxiliary variables some rules need (weekly rest: which rest
 * interval is kept; a weekend cap: which weekends may be worked), each belonging to one person.
 * Hard exclusions (skill, `cannot` wishes, absences, hard shift-level terms, hard night length)
 * shrink domains instead of adding -Infinity entries. Always-hard structure stays here:
 * double booking (all-different over a shift's seats and over overlapping shifts), pins,
 * skills, absences, wishes and pairings.
 *
 * The model's score of any assignment whose aux variables are set by `bestAux` equals
 * scoreRoster's total for the decoded roster (tests/solver/roster/score-consistency.test.ts);
 * any other aux values score at most that.
 */
import type { AllDifferentFactor, CountingFactor, Factor, Model, UnaryFactor, Variable } from '../model';
import { factorScore } from '../model';
import { absenceBlocks, absenceCredits, describeShift, periodDays, shiftFacts, type ShiftFacts } from '../../shared/roster/derive';
import type { Roster, TermKind } from '../../shared/roster/schema';
import { TERM_NAMES, type TermName } from './term-names';
import { RULES, TERMS } from './rules';
import type { AuxChoice, CompileContext } from './rules/types';
import { capFor as capForRules } from './rules/caps';

export const OPEN = -1;

/**
 * An auxiliary variable (contract with solver/roster/lagrangian.ts and local search): it comes
 * after every seat variable, belongs to one person, and every factor touching it touches only
 * it and seat variables restricted to that person's value. `choices[j]` = the seats that value j
 * requires free of the person (`CompiledRoster.valueOf(seat, person)` is the person's value in
 * each), and value j's own score (its unary).
 */
export type AuxVariable = {
  v: number;
  person: number;
  term: TermName;
  /** Period days the aux is about (the rule's window). */
  first: number;
  last: number;
  choices: { seats: Int32Array; score: number }[];
};

export type CompiledRoster = {
  roster: Roster;
  model: Model;
  facts: ShiftFacts[];
  /** seat id → variable index (every seat has one). */
  seatIndex: Map<string, number>;
  /** variable index → seat id, for the seat variables (they follow roster.seats order). */
  seatIds: string[];
  /**
   * Per model variable, the person of each value (-1 = open): the variable's keys. Seat
   * variables come first (roster.seats order); aux variables after them have every key -1.
   */
  domains: number[][];
  personIndex: Map<string, number>;
  /** Score parts that do not depend on the assignment (e.g. contracted hours of someone who can take no seat). */
  termConstants: Record<TermName, number>;
  /** Minutes per unit of hour-weights in counting factors. */
  minuteUnit: number;
  /**
   * Factors that carry several terms (identical counting factors merged, e.g. shifts per window and
   * the 7-day hours when all shifts have one length): factor index → each term's own table.
   */
  parts: ({ term: TermName; table: Float64Array }[] | undefined)[];
  /** Auxiliary variables, in variable order (all after the seats). */
  aux: AuxVariable[];
  /** The value of a seat variable that puts the person in it (-1 when they cannot take the seat). */
  valueOf: (seat: number, person: number) => number;
};

function gcd(a: number, b: number): number {
  while (b) [a, b] = [b, a % b];
  return a;
}

/** Term a factor belongs to, from its id prefix. */
export function termOf(f: Factor): TermName {
  return (f.id ?? '').split(':')[0] as TermName;
}

/**
 * Set every aux variable of `x` to its best value given the seat values in x (in place):
 * the highest-scoring choice whose seats the person does not hold (ties: the first). A hard
 * rule with no such choice leaves the first choice (the roster is infeasible anyway).
 * Returns x. x may be a seat-only assignment only if it has room for the aux variables.
 */
export function bestAux<T extends { [i: number]: number; length: number }>(compiled: CompiledRoster, x: T): T {
  for (const a of compiled.aux) {
    let best = 0;
    let bestScore = -Infinity;
    a.choices.forEach((c, j) => {
      if (c.score <= bestScore) return;
      for (let k = 0; k < c.seats.length; k++) if (x[c.seats[k]] === compiled.valueOf(c.seats[k], a.person)) return;
      best = j;
      bestScore = c.score;
    });
    x[a.v] = best;
  }
  return x;
}

/** A full model assignment from seat values (aux variables set by bestAux). */
export function withAux(compiled: CompiledRoster, seats: ArrayLike<number>): Int32Array {
  const x = new Int32Array(compiled.model.variables.length);
  for (let s = 0; s < compiled.seatIds.length; s++) x[s] = seats[s];
  return bestAux(compiled, x);
}

/**
 * The seat × person value table as a function. Made outside compileRoster so that the function
 * CompiledRoster keeps holds only the table: a closure made inside would keep the whole compile's
 * scope alive (its merge keys and caches, 78 MB on 60 people × 13 weeks).
 */
/** An array of exactly n items (a spread into an array literal may leave spare capacity). */
function exactArray<T>(n: number, at: (k: number) => T): T[] {
  const out = new Array<T>(n);
  for (let k = 0; k < n; k++) out[k] = at(k);
  return out;
}

const NO_SEATS = new Int32Array(0);

/**
 * The aux choices' seat lists, in choice order, in one Int32Array; `share` makes each choice's
 * `seats` a view into it. One small Int32Array per choice cost ~190 bytes beside its data
 * (60 people × 13 weeks: 100,000 choices, 31 MB in all; 20 MB as views).
 */
function seatPool() {
  let pool = new Int32Array(1 << 16);
  let used = 0;
  const lengths: number[] = [];
  return {
    add(seats: readonly number[]) {
      if (used + seats.length > pool.length) {
        const grown = new Int32Array(Math.max(pool.length * 2, used + seats.length));
        grown.set(pool.subarray(0, used));
        pool = grown;
      }
      for (let k = 0; k < seats.length; k++) pool[used + k] = seats[k];
      used += seats.length;
      lengths.push(seats.length);
    },
    share(auxVars: AuxVariable[]) {
      const exact = pool.slice(0, used);
      let at = 0;
      let c = 0;
      for (const a of auxVars)
        for (const choice of a.choices) {
          const n = lengths[c++];
          choice.seats = n ? exact.subarray(at, at + n) : NO_SEATS;
          at += n;
        }
      pool = NO_SEATS;
    },
  };
}

function seatValueLookup(table: Int32Array, nPeople: number): (seat: number, person: number) => number {
  return (s, p) => table[s * nPeople + p];
}

export function compileRoster(roster: Roster): CompiledRoster {
  const rules = roster.rules;
  const on = (t: keyof typeof rules) => rules[t].enabled && (rules[t].hard || rules[t].weight > 0);
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
  const nPeople = roster.people.length;

  // wishes per (person, shift): cannot, and net prefer/avoid points
  const cannot = new Set<number>();
  const wishPoints = new Map<number, number>();
  const nShifts = roster.shifts.length;
  const shiftsOnDate = new Map<string, number[]>();
  facts.forEach((f) => shiftsOnDate.set(f.date, [...(shiftsOnDate.get(f.date) ?? []), f.index]));
  for (const w of roster.wishes) {
    const p = personIndex.get(w.person)!;
    const targets = w.shift !== undefined ? [shiftIdx.get(w.shift)!] : (shiftsOnDate.get(w.date!) ?? []);
    for (const sh of targets) {
      const key = p * nShifts + sh;
      if (w.kind === 'cannot') cannot.add(key);
      else wishPoints.set(key, (wishPoints.get(key) ?? 0) + (w.kind === 'prefer' ? w.strength : -w.strength));
    }
  }
  const away = absenceBlocks(roster, facts);
  // shift-level per-person terms: hard ones shrink domains, soft ones are unaries below
  const shiftTerms = roster.people.map((person) =>
    person.terms.flatMap((t, i) => {
      const m = TERMS[t.kind];
      return m.breaksShift && (t.hard || t.weight > 0) ? [{ t, i, breaks: (f: ShiftFacts) => (m.breaksShift as (t: unknown, f: ShiftFacts, r: Roster) => boolean)(t, f, roster) }] : [];
    }),
  );
  const ruleExcludes = RULES.filter((m) => m.excludesShift && on(m.id) && rules[m.id].hard);

  // domains
  const domains: number[][] = [];
  const hardUnary: { v: number; term: TermName; detail: string; bad: Set<number> }[] = [];
  const openForbidden = on('coverage') && rules.coverage.hard;
  roster.seats.forEach((seat, s) => {
    const f = facts[seatShift[s]];
    const pinned = pinOf.get(seat.id);
    const excluded = (p: number): { term: TermName; detail: string } | null => {
      if (cannot.has(p * nShifts + f.index)) return { term: 'wishes', detail: 'hard' };
      if (away.get(p)?.has(f.index)) return { term: 'absences', detail: roster.people[p].id };
      for (const m of ruleExcludes) if ((m.excludesShift as (s: unknown, f: ShiftFacts) => boolean)(rules[m.id], f)) return { term: m.id, detail: 'hard' };
      for (const st of shiftTerms[p]) if (st.t.hard && st.breaks(f)) return { term: st.t.kind, detail: `${roster.people[p].id}:${st.i}` };
      return null;
    };
    let values: number[];
    if (pinned !== undefined) {
      values = [pinned];
      // a pin keeps its value even when a hard rule forbids it: the model then says infeasible, as the scorer does
      if (pinned !== OPEN) {
        const why = excluded(pinned);
        if (why) hardUnary.push({ v: s, term: why.term, detail: why.detail, bad: new Set([0]) });
      }
    } else {
      const people: number[] = [];
      roster.people.forEach((p, i) => {
        if ((seat.skill === null || p.skills.includes(seat.skill)) && excluded(i) === null) people.push(i);
      });
      values = !openForbidden || people.length === 0 ? [...people, OPEN] : people;
    }
    if (openForbidden) {
      const o = values.indexOf(OPEN);
      if (o >= 0) hardUnary.push({ v: s, term: 'coverage', detail: 'hard', bad: new Set([o]) });
    }
    domains.push(values);
  });

  // value index of person p in seat s, or -1: flat arrays, looked up millions of times on large rosters
  const nSeats = domains.length;
  const valueTable = new Int32Array(nSeats * nPeople).fill(-1);
  domains.forEach((d, s) => d.forEach((p, x) => p !== OPEN && (valueTable[s * nPeople + p] = x)));
  const valueAt = seatValueLookup(valueTable, nPeople);

  for (const h of hardUnary) {
    const table = new Float64Array(domains[h.v].length);
    for (const x of h.bad) table[x] = -Infinity;
    factors.push({ kind: 'unary', v: h.v, table, hard: true, id: `${h.term}:${h.detail}:${roster.seats[h.v].id}`, label: `${h.term} (hard) on ${roster.seats[h.v].id}` } satisfies UnaryFactor);
  }

  // wishes and soft shift-level terms: unaries
  roster.seats.forEach((seat, s) => {
    const f = facts[seatShift[s]];
    const d = domains[s];
    const wt = new Float64Array(d.length);
    let anyWish = false;
    d.forEach((p, x) => {
      const pts = p === OPEN ? undefined : wishPoints.get(p * nShifts + f.index);
      if (pts) {
        wt[x] = pts;
        anyWish = true;
      }
    });
    if (anyWish) factors.push({ kind: 'unary', v: s, table: wt, id: `wishes:${seat.id}`, label: `wishes for ${describeShift(f)}` });
    d.forEach((p, x) => {
      if (p === OPEN) return;
      for (const st of shiftTerms[p]) {
        if (st.t.hard || !st.breaks(f)) continue;
        const table = new Float64Array(d.length);
        table[x] = -st.t.weight;
        factors.push({ kind: 'unary', v: s, table, id: `${st.t.kind}:${roster.people[p].id}:${st.i}:${seat.id}`, label: `${roster.people[p].name}'s ${st.t.kind} term on ${describeShift(f)}` });
      }
    });
  });

  // double booking: one seat each per shift, and overlapping shifts
  const byStart = facts.map((f) => f.index).sort((a, b) => facts[a].startMs - facts[b].startMs || a - b);
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
      if (B.startMs >= A.endMs) break; // sorted by start: no later shift overlaps A
      const sa = seatsOfShift[A.index];
      const sb = seatsOfShift[B.index];
      if (sa.length && sb.length && shareSomeone(sa, sb))
        factors.push({ kind: 'allDifferent', vars: [...sa, ...sb], id: `doubleBooking:${A.id}:${B.id}`, label: `${describeShift(A)} overlaps ${describeShift(B)}` });
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

  // counting factors: hours in integer units of the greatest common divisor of shift lengths
  let unit = 0;
  for (const f of facts) if (seatsOfShift[f.index].length) unit = gcd(unit, f.minutes);
  unit = Math.max(1, unit);
  let maxShiftMinutes = 0;
  let minShiftMinutes = Infinity;
  for (const f of facts)
    if (seatsOfShift[f.index].length) {
      maxShiftMinutes = Math.max(maxShiftMinutes, f.minutes);
      minShiftMinutes = Math.min(minShiftMinutes, f.minutes);
    }
  const capFor = (spanDays: number, minutesWeighted: boolean) => capForRules(roster, days, spanDays, minutesWeighted, unit, minShiftMinutes, maxShiftMinutes);

  // [[x, w]] lists shared between factors: a list says only "value x weighs w", so every factor
  // and seat with that value and weight shares one (60 people × 13 weeks: 4.3 M entries, ~330,000
  // lists per seat and value, 39 MB; now a few hundred). Nothing writes a weight list after compiling.
  const listsByWeight = new Map<number, [number, number][][]>();
  const weightList = (x: number, w: number): [number, number][] => {
    let byValue = listsByWeight.get(w);
    if (!byValue) listsByWeight.set(w, (byValue = []));
    return (byValue[x] ??= [[x, w]]);
  };

  /** Merged counting factors: same person, same vars and weights (e.g. shifts per window and 7-day hours with equal shifts). */
  const mergeable = new Map<string, number>();
  const parts: ({ term: TermName; table: Float64Array }[] | undefined)[] = [];

  const personCount: CompileContext['personCount'] = (term, detail, label, p, seats, weightOf, scoreAt, hard, cap, mergeKey) => {
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
      weights.push(weightList(x, w));
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

  const auxVars: AuxVariable[] = [];
  const auxPool = seatPool();
  const auxLabels: string[][] = [];
  const auxNames: string[] = [];
  // 0 up to M, −∞ past it; one shared read-only table per M (factor tables are never written
  // after compiling): on 200 people × 4 weeks the weekly rest alone made 84,000 of them.
  const forbidTables = new Map<number, Float64Array>();
  const forbidScore = (M: number) => {
    let t = forbidTables.get(M);
    if (!t) forbidTables.set(M, (t = new Float64Array(M + 2))), (t[M + 1] = -Infinity);
    return t;
  };
  const auxChoice = (term: TermName, detail: string, label: string, p: number, first: number, last: number, choices: AuxChoice[]): number => {
    const v = nSeats + auxVars.length;
    const entry: AuxVariable = {
      v,
      person: p,
      term,
      first,
      last,
      // seats: views into one pool, set when compiling ends (see auxPool)
      choices: choices.map((c) => ({ seats: NO_SEATS, score: c.score })),
    };
    auxVars.push(entry);
    auxLabels.push(choices.map((c) => c.label));
    auxNames.push(`${term}:${detail}`);
    choices.forEach((c, j) => {
      const seats = c.seats.filter((s) => valueAt(s, p) >= 0);
      auxPool.add(seats);
      if (!seats.length) return;
      // value j weighs M (more than every seat together): sum ≤ M ⇔ not (aux = j and one of the seats held)
      const M = seats.length + 1;
      const auxWeights = weightList(j, M);
      const score = forbidScore(M);
      factors.push({
        kind: 'counting',
        vars: exactArray(seats.length + 1, (k) => (k === 0 ? v : seats[k - 1])),
        weights: exactArray(seats.length + 1, (k) => (k === 0 ? auxWeights : weightList(valueAt(seats[k - 1], p), 1))),
        score,
        hard: true,
        // joined, not template strings: a join is one flat string, a template a tree of pieces
        // (85,872 weekly-rest factors on 60 × 13 weeks)
        id: [term, detail, j].join(':'),
        label: [label, choices[j].label].join(': '),
      } satisfies CountingFactor);
    });
    if (entry.choices.some((c) => c.score !== 0)) {
      const table = Float64Array.from(entry.choices, (c) => c.score);
      factors.push({ kind: 'unary', v, table, id: `${term}:${detail}`, label } satisfies UnaryFactor);
    }
    return v;
  };

  const ctx: CompileContext = {
    roster,
    facts,
    days,
    unit,
    nPeople,
    seatShift,
    seatsOfShift,
    allSeats: roster.seats.map((_, s) => s),
    domains,
    valueAt,
    credits: absenceCredits(roster),
    factors,
    termConstants,
    on,
    personCount,
    minutesW: (s) => facts[seatShift[s]].minutes / unit,
    one: () => 1,
    capFor,
    seatsStarting: (first, last, pick) => {
      const out: number[] = [];
      for (let s = 0; s < nSeats; s++) {
        const f = facts[seatShift[s]];
        if (f.day >= first && f.day <= last && (!pick || pick(f))) out.push(s);
      }
      return out;
    },
    auxChoice,
  };

  for (const m of RULES) if (on(m.id)) (m.compile as (c: CompileContext, s: unknown) => void)(ctx, rules[m.id]);
  roster.people.forEach((person, p) =>
    person.terms.forEach((t, i) => {
      if (!t.hard && t.weight === 0) return;
      const m = TERMS[t.kind as TermKind];
      if (m.compile) (m.compile as (c: CompileContext, p: number, t: unknown, i: number) => void)(ctx, p, t, i);
    }),
  );

  const variables: Variable[] = roster.seats.map((seat, s) => ({
    name: seat.id,
    cardinality: domains[s].length,
    labels: domains[s].map((p) => (p === OPEN ? 'open' : roster.people[p].name)),
    keys: Int32Array.from(domains[s]),
  }));
  auxPool.share(auxVars);
  auxVars.forEach((a, k) => {
    const n = a.choices.length;
    variables.push({ name: auxNames[k], cardinality: n, labels: auxLabels[k], keys: new Int32Array(n).fill(OPEN) });
    domains.push(new Array<number>(n).fill(OPEN));
  });

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
    aux: auxVars,
    valueOf: valueAt,
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
