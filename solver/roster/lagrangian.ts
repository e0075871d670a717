/**
 * A roster-specific upper bound by Lagrangian relaxation (person decomposition, the bound
 * column generation reaches for rostering): the link "seat s holds person p" ⇔ "p works seat s"
 * is dualised with multipliers μ_s(p); then
 *
 *   L(μ, ν) = Σ_shifts max over the shift's seats [unaries − μ + the shift's own counting factors]
 *           + Σ_people max over the person's schedules [person factors + μ (+ ν terms)] + constant
 *
 * is an upper bound on the model's best score for EVERY μ, ν (weak duality), and subgradient
 * steps (Polyak) on μ, ν lower it.
 *
 * Shift side: each shift's seats are chosen jointly by a dynamic programme over the seats with
 * the sums of the factors that live on the shift and mix people (skill mix, pairings) as state;
 * keys of small mixed factors may appear only once per shift (the shift's all-different is hard,
 * so this is implied, not added).
 * Person side: one schedule per person, exactly, by dynamic programming over days; the state is
 * what the person worked on each of the last `lookback` days, so every factor of that person
 * that spans at most lookback + 1 days (weekly rest, hours per 7 days, consecutive days, nights
 * in a row), every hard all-different between their shifts (overlap, minimum rest) and every
 * soft rest penalty is exact. Person factors spanning longer (contracted hours, fair nights and
 * weekends over the period) are relaxed through their conjugate: f(S) ≤ max_t [f(t) − ν t] + ν S
 * for any ν (one multiplier per factor, also a subgradient variable).
 *
 * Built from the compiled model (the factors' own weights and tables), so the bound is about
 * exactly the model solveMap solves. When a model has a factor outside this structure (dense
 * tables, soft all-different, a person factor whose weight differs between seats of one shift…)
 * `buildLagrangian` returns `{ unsupported }` and the caller keeps the MPLP bound alone.
 */
import type { AllDifferentFactor, CountingFactor, Model, SameKeyFactor } from '../model/types';
import { countingMaxSum, countingScoreAt } from '../model/factor-graph';
import { OPEN, type CompiledRoster } from './compile';

const NEG = -Infinity;
/** Work cap for one shift's DP: states (sums of its mixed factors × keys used) × seat values. */
const SHIFT_DP_WORK = 40_000;

interface WindowFactor {
  /** Last day of the factor's span: scored when the DP reaches it. */
  last: number;
  span: number;
  /** weight[k][option] of the option chosen on day last − k (k = 0..span−1). */
  weights: Int32Array[];
  table: Float64Array;
}

interface PeriodFactor {
  /** The model factor's id (names its multiplier across runs). */
  id: string;
  /** Per (day, option): weight of that option. */
  weight: Int32Array[];
  table: Float64Array; // f(t) for t = 0..maxSum
  /** Largest sum reachable under the person's hard rules (≤ maxSum). */
  tmax?: number;
}

/** State indexes of one day's transitions: 16 bits when every day has under 65,536 states. */
type StateIndexes = Uint16Array | Int32Array;

interface Transitions {
  from: StateIndexes[];
  opt: Uint8Array[];
  to: StateIndexes[];
  fixed: Float64Array[];
  nStates: number[];
}

interface PersonPlan {
  p: number;
  days: number;
  /** options[d][o] = list of shift indices (o = 0: no shift). */
  options: number[][][];
  /** For each shift the person may take: (seat, value) pairs. */
  seatsOfShift: Map<number, { seat: number; value: number }[]>;
  period: PeriodFactor[];
  /** Transitions per day: from state index, option, to state index, fixed score. */
  from: StateIndexes[];
  opt: Uint8Array[];
  to: StateIndexes[];
  fixed: Float64Array[];
  nStates: number[];
}

interface ShiftPlan {
  seats: number[];
  /** Allowed values per seat (hard unaries removed) and their unary scores. */
  values: number[][];
  unary: Float64Array[];
  /** Mixed counting factors on the shift: per factor, weight per (seat slot, value). */
  mixed: { weights: Map<number, number>[]; table: Float64Array; cap: number }[];
  /** Keys that may appear at most once in the shift's DP (keys of small mixed factors). */
  tracked: Map<number, number>;
}

export interface LagrangianSetup {
  compiled: CompiledRoster;
  /** Per seat variable (aux variables left out), the person of each value. */
  domains: number[][];
  /** Some auxiliary variables' factors are left out of the relaxation (windows longer than the lookback; see buildLagrangian). */
  relaxedAux: boolean;
  people: PersonPlan[];
  shifts: ShiftPlan[];
  constant: number;
  /** μ index per (seat, value) with a person; -1 for open. */
  muIndex: Int32Array[];
  nMu: number;
  nNu: number;
  lookback: number;
}

export interface LagrangianOptions {
  /** Longest span in days kept exact in the person DP (longer factors are relaxed). */
  maxLookback?: number;
  /** Cap on DP transitions over all people (memory); above it the build gives up. */
  maxTransitions?: number;
  /** Give up (unsupported: 'out of time') once `now()` passes this, checked person by person. */
  deadline?: number;
  now?: () => number;
}

/** Prepare the relaxation, or say why this model does not fit it. */
export function buildLagrangian(compiled: CompiledRoster, opts: LagrangianOptions = {}): LagrangianSetup | { unsupported: string } {
  const model: Model = compiled.model;
  const { roster, facts } = compiled;
  // Auxiliary variables (weekly rest: which rest interval is kept) and the factors touching them
  // are not taken as model factors: the person DP scores them per window (restWindows below).
  // Windows too long for the DP are left out; each of their factors scores ≤ 0 (a hard "seats
  // free" test or a soft −weight), so dropping them only raises the maximum: still a bound.
  const nSeatVars = compiled.seatIds.length;
  const domains = compiled.domains.slice(0, nSeatVars);
  // compile.ts makes aux variables only in unaries and counting factors
  const touchesAux = (f: Model['factors'][number]) => (f.kind === 'unary' ? f.v >= nSeatVars : f.kind === 'counting' ? f.vars.some((v) => v >= nSeatVars) : false);
  const maxLookback = opts.maxLookback ?? 6;
  const maxTransitions = opts.maxTransitions ?? 12_000_000;
  const nSeats = domains.length;
  const nPeople = roster.people.length;
  const shiftIdx = new Map(roster.shifts.map((s, i) => [s.id, i]));
  const seatShift = roster.seats.map((s) => shiftIdx.get(s.shift)!);
  const nShifts = roster.shifts.length;
  const dayOf = (sh: number) => facts[sh]!.day;
  const days = facts.length ? Math.max(...facts.map((f) => f.day)) + 1 : 0;
  // value index of person p at seat s (-1 if none)
  const valueAt = (s: number, p: number) => domains[s]!.indexOf(p);

  const unary = domains.map((d) => new Float64Array(d.length));
  const shiftMixed: ShiftPlan['mixed'][] = Array.from({ length: nShifts }, () => []);
  const personCounting: { p: number; f: CountingFactor }[] = [];
  // per person: conflicting shift pairs and soft penalties between shift pairs
  const conflicts: Set<number>[] = Array.from({ length: nPeople }, () => new Set());
  const pairPenalty: Map<number, number>[] = Array.from({ length: nPeople }, () => new Map());
  const pairCover: Map<number, number>[] = Array.from({ length: nPeople }, () => new Map());
  const pairKey = (a: number, b: number) => (a < b ? a * nShifts + b : b * nShifts + a);
  // seats of a shift that are in one hard all-different together (a person holds at most one)
  const shiftCovered = new Uint8Array(nShifts);
  const seatsOfShiftAll: number[][] = Array.from({ length: nShifts }, () => []);
  seatShift.forEach((sh, s) => seatsOfShiftAll[sh]!.push(s));
  let constant = model.constant ?? 0;

  for (const f of model.factors) {
    if (compiled.aux.length && touchesAux(f)) continue;
    switch (f.kind) {
      case 'unary':
        for (let x = 0; x < f.table.length; x++) unary[f.v]![x] += f.table[x]!;
        break;
      case 'allDifferent': {
        const af = f as AllDifferentFactor;
        if (af.penalty !== undefined && af.penalty !== NEG) return { unsupported: 'soft all-different' };
        const byPerson = new Map<number, Set<number>>();
        for (const s of af.vars) for (const p of domains[s]!) if (p !== OPEN) (byPerson.get(p) ?? byPerson.set(p, new Set()).get(p)!).add(seatShift[s]!);
        for (const [p, shs] of byPerson) {
          const list = [...shs];
          for (let i = 0; i < list.length; i++) for (let j = i + 1; j < list.length; j++) conflicts[p]!.add(pairKey(list[i]!, list[j]!));
        }
        const shs = new Set(af.vars.map((s) => seatShift[s]!));
        for (const sh of shs) if (seatsOfShiftAll[sh]!.every((s) => af.vars.includes(s))) shiftCovered[sh] = 1;
        break;
      }
      case 'sameKey': {
        const sk = f as SameKeyFactor;
        const A = seatShift[sk.a]!, B = seatShift[sk.b]!;
        if (A === B) return { unsupported: 'sameKey within one shift' };
        for (const p of domains[sk.a]!) {
          if (p === OPEN || valueAt(sk.b, p) < 0) continue;
          const k = pairKey(A, B);
          if (sk.weight === NEG) {
            conflicts[p]!.add(k);
          } else {
            const w = pairPenalty[p]!.get(k);
            if (w !== undefined && w !== sk.weight) return { unsupported: 'unequal rest penalties' };
            pairPenalty[p]!.set(k, sk.weight);
          }
          pairCover[p]!.set(k, (pairCover[p]!.get(k) ?? 0) + 1);
        }
        break;
      }
      case 'counting': {
        const cf = f as CountingFactor;
        const keys = new Set<number>();
        cf.vars.forEach((s, j) => {
          for (const [x, w] of cf.weights[j]!) if (w > 0) keys.add(domains[s]![x]!);
        });
        if (keys.size === 0) {
          constant += countingScoreAt(cf, 0);
          break;
        }
        if (keys.size === 1 && !keys.has(OPEN)) {
          personCounting.push({ p: [...keys][0]!, f: cf });
          break;
        }
        const shs = new Set(cf.vars.map((s) => seatShift[s]!));
        if (shs.size !== 1) return { unsupported: 'a factor mixing people across shifts' };
        const sh = [...shs][0]!;
        const slotOf = new Map(seatsOfShiftAll[sh]!.map((s, i) => [s, i]));
        const weights = seatsOfShiftAll[sh]!.map(() => new Map<number, number>());
        cf.vars.forEach((s, j) => {
          for (const [x, w] of cf.weights[j]!) if (w > 0) weights[slotOf.get(s)!]!.set(x, (weights[slotOf.get(s)!]!.get(x) ?? 0) + w);
        });
        const maxSum = countingMaxSum(cf);
        const len = typeof cf.score === 'function' ? maxSum + 1 : Math.min(maxSum + 1, cf.score.length);
        const table = new Float64Array(Math.max(1, len));
        for (let t = 0; t < table.length; t++) table[t] = countingScoreAt(cf, t);
        shiftMixed[sh]!.push({ weights, table, cap: table.length - 1 });
        break;
      }
      default:
        return { unsupported: `${f.kind} factor` };
    }
  }
  // every shift where someone could take two seats must be covered by one hard all-different
  for (let sh = 0; sh < nShifts; sh++) {
    if (shiftCovered[sh] || seatsOfShiftAll[sh]!.length < 2) continue;
    for (let p = 0; p < nPeople; p++) if (seatsOfShiftAll[sh]!.filter((s) => valueAt(s, p) >= 0).length >= 2) return { unsupported: 'a shift without one-seat-each' };
  }
  // a soft rest penalty must cover every pair of the person's seats in the two shifts
  for (let p = 0; p < nPeople; p++)
    for (const [k, n] of pairCover[p]!) {
      const A = Math.floor(k / nShifts), B = k % nShifts;
      const na = seatsOfShiftAll[A]!.filter((s) => valueAt(s, p) >= 0).length;
      const nb = seatsOfShiftAll[B]!.filter((s) => valueAt(s, p) >= 0).length;
      if (n !== na * nb) return { unsupported: 'a rest penalty on some seats of two shifts only' };
    }

  // ---- shift side
  const muIndex = domains.map((d) => new Int32Array(d.length).fill(-1));
  let nMu = 0;
  // one multiplier per (shift, person): "p holds a seat of the shift" ⇔ "p works the shift"
  // (a person holds at most one seat of a shift, so the seat-level links add nothing at the optimum)
  const muOfShiftPerson = new Map<number, number>();
  domains.forEach((d, s) =>
    d.forEach((p, x) => {
      if (p === OPEN || unary[s]![x]! === NEG) return;
      const key = seatShift[s]! * nPeople + p;
      let k = muOfShiftPerson.get(key);
      if (k === undefined) muOfShiftPerson.set(key, (k = nMu++));
      muIndex[s]![x] = k;
    }),
  );
  const shifts: ShiftPlan[] = [];
  for (let sh = 0; sh < nShifts; sh++) {
    const seats = seatsOfShiftAll[sh]!;
    const values = seats.map((s) => domains[s]!.map((_, x) => x).filter((x) => unary[s]![x]! > NEG));
    const tracked = new Map<number, number>();
    // mixed factors go into the shift's DP while its states stay few (skill mix first: it is the
    // one with many keys); the others are replaced by a linear majorant a + b·S ≥ f(S) for every
    // reachable S (b = max_t (f(t) − f(0))/t, at least 0), folded into the unaries: still a bound
    const byKeys = shiftMixed[sh]!.map((m) => {
      const ks = new Set<number>();
      m.weights.forEach((w, i) => w.forEach((_, x) => ks.add(domains[seats[i]!]![x]!)));
      return { m, ks };
    });
    byKeys.sort((x, y) => y.ks.size - x.ks.size);
    const inDp: ShiftPlan['mixed'] = [];
    let states = 1;
    const stateCap = Math.max(16, Math.floor(SHIFT_DP_WORK / Math.max(1, values.reduce((m, v) => m + v.length, 0))));
    const unaries = seats.map((s) => Float64Array.from(unary[s]!));
    for (const { m, ks } of byKeys) {
      const newKeys = ks.size <= 4 ? [...ks].filter((k) => k !== OPEN && !tracked.has(k)) : [];
      const grow = (m.cap + 1) * 2 ** newKeys.length;
      if (states * grow <= stateCap) {
        states *= grow;
        inDp.push(m);
        for (const k of newKeys) tracked.set(k, tracked.size);
        continue;
      }
      const f0 = m.table[0]!;
      let b = 0;
      for (let t = 1; t < m.table.length; t++) b = Math.max(b, (m.table[t]! - f0) / t);
      const a = b === 0 ? Math.max(...m.table) : f0;
      constant += a;
      if (b > 0) m.weights.forEach((w, i) => w.forEach((wt, x) => (unaries[i]![x] += b * wt)));
    }
    shifts.push({ seats, values, unary: unaries, mixed: inDp, tracked });
  }

  // ---- person side
  // day span of each person factor; longest exact span
  const shiftsOfPerson: Map<number, { seat: number; value: number }[]>[] = Array.from({ length: nPeople }, () => new Map());
  domains.forEach((d, s) =>
    d.forEach((p, x) => {
      if (p === OPEN || unary[s]![x]! === NEG) return;
      const m = shiftsOfPerson[p]!;
      const sh = seatShift[s]!;
      (m.get(sh) ?? m.set(sh, []).get(sh)!).push({ seat: s, value: x });
    }),
  );
  /** Weight of factor f for person p on shift sh, equal over p's seats of the shift, or null. */
  const shiftWeights = (p: number, f: CountingFactor): Map<number, number> | null => {
    const bySeat = new Map<number, number>();
    f.vars.forEach((s, j) => {
      for (const [x, w] of f.weights[j]!) if (w > 0 && domains[s]![x] === p) bySeat.set(s, (bySeat.get(s) ?? 0) + w);
    });
    const out = new Map<number, number>();
    for (const [sh, list] of shiftsOfPerson[p]!) {
      const w0 = bySeat.get(list[0]!.seat) ?? 0;
      for (const { seat } of list) if ((bySeat.get(seat) ?? 0) !== w0) return null;
      if (w0) out.set(sh, w0);
    }
    // a weighted seat the person cannot take (hard unary) weighs nothing: fine
    return out;
  };

  let lookback = 0;
  // Auxiliary choices (weekly rest: which rest interval is kept) whose window fits the DP's
  // lookback become exact person factors: at the window's last day the DP scores the best
  // choice whose shifts the schedule leaves free. Shifts of a choice that start before the
  // window (a night from the day before) are not in the state and are taken as free: that only
  // raises the score, so L stays an upper bound. Longer windows stay left out (above).
  // Only windows within the lookback the other factors need already: a longer lookback multiplies
  // the DP's states (measured on the demo: 7-day rest windows took the build from 0.4 s to 2 s
  // and 0.45 M to 1.1 M transitions for a bound 1 point lower after 30 s).
  const restWindows: { first: number; last: number; choices: { shifts: Set<number>; score: number }[] }[][] = Array.from({ length: nPeople }, () => []);
  let auxLeftOut = false;
  const addRestWindows = () => {
    for (const a of compiled.aux) {
      if (a.last - a.first > lookback) {
        auxLeftOut = true;
        continue;
      }
      restWindows[a.person]!.push({
        first: a.first,
        last: a.last,
        choices: a.choices.map((c) => ({ shifts: new Set(Array.from(c.seats, (seat) => seatShift[seat]!).filter((sh) => dayOf(sh) >= a.first)), score: c.score })),
      });
    }
  };
  const perPersonFactors: { window: { f: CountingFactor; w: Map<number, number>; first: number; last: number }[]; period: { f: CountingFactor; w: Map<number, number> }[] }[] = Array.from({ length: nPeople }, () => ({ window: [], period: [] }));
  for (const { p, f } of personCounting) {
    const w = shiftWeights(p, f);
    if (!w) return { unsupported: 'a person factor weighing seats of one shift differently' };
    if (w.size === 0) {
      constant += countingScoreAt(f, 0);
      continue;
    }
    let first = Infinity, last = -Infinity;
    for (const sh of w.keys()) {
      first = Math.min(first, dayOf(sh));
      last = Math.max(last, dayOf(sh));
    }
    if (last - first <= maxLookback) {
      perPersonFactors[p]!.window.push({ f, w, first, last });
      lookback = Math.max(lookback, last - first);
    } else perPersonFactors[p]!.period.push({ f, w });
  }
  for (let p = 0; p < nPeople; p++)
    for (const k of [...conflicts[p]!, ...pairPenalty[p]!.keys()]) {
      const A = Math.floor(k / nShifts), B = k % nShifts;
      const dist = Math.abs(dayOf(A) - dayOf(B));
      if (dist > maxLookback) return { unsupported: 'rest or overlap across more days than the lookback' };
      lookback = Math.max(lookback, dist);
    }
  addRestWindows();
  lookback = Math.max(1, lookback);

  const people: PersonPlan[] = [];
  let totalTransitions = 0;
  const shared = new Map<string, Transitions>();
  let nNu = 0;
  for (let p = 0; p < nPeople; p++) {
    if (opts.deadline !== undefined && (opts.now ?? Date.now)() > opts.deadline) return { unsupported: 'out of time' };
    const myShifts = shiftsOfPerson[p]!;
    const byDay: number[][] = Array.from({ length: days }, () => []);
    for (const sh of myShifts.keys()) byDay[dayOf(sh)]!.push(sh);
    const conflict = (a: number, b: number) => a === b || conflicts[p]!.has(pairKey(a, b));
    const options: number[][][] = byDay.map((list) => {
      const out: number[][] = [[]];
      const rec = (i: number, cur: number[]) => {
        for (let j = i; j < list.length; j++) {
          if (cur.some((c) => conflict(c, list[j]!))) continue;
          const next = [...cur, list[j]!];
          out.push(next);
          rec(j + 1, next);
        }
      };
      rec(0, []);
      return out;
    });
    if (options.some((o) => o.length > 255)) return { unsupported: 'too many shift choices in a day' };
    const { window, period } = perPersonFactors[p]!;
    // per window factor: weights per (k, option) for its last day
    const windowsByLast: WindowFactor[][] = Array.from({ length: days }, () => []);
    for (const wf of window) {
      const span = wf.last - wf.first + 1;
      const weights: Int32Array[] = [];
      for (let k = 0; k < span; k++) {
        const d = wf.last - k;
        weights.push(Int32Array.from(options[d]!, (o) => o.reduce((m, sh) => m + (wf.w.get(sh) ?? 0), 0)));
      }
      const maxSum = countingMaxSum(wf.f);
      const table = new Float64Array(maxSum + 1);
      for (let t = 0; t <= maxSum; t++) table[t] = countingScoreAt(wf.f, t);
      windowsByLast[wf.last]!.push({ last: wf.last, span, weights, table });
    }
    const restByLast: { span: number; scores: Float64Array; blocked: Uint8Array[][] }[][] = Array.from({ length: days }, () => []);
    for (const rw of restWindows[p]!) {
      const span = rw.last - rw.first + 1;
      // blocked[j][k][option on day last − k]: the option works a shift choice j needs free
      const blocked = rw.choices.map((c) => Array.from({ length: span }, (_, k) => Uint8Array.from(options[rw.last - k]!, (o) => (o.some((sh) => c.shifts.has(sh)) ? 1 : 0))));
      restByLast[rw.last]!.push({ span, scores: Float64Array.from(rw.choices, (c) => c.score), blocked });
    }
    const periodF: PeriodFactor[] = period.map(({ f, w }) => {
      const maxSum = countingMaxSum(f);
      const table = new Float64Array(maxSum + 1);
      for (let t = 0; t <= maxSum; t++) table[t] = countingScoreAt(f, t);
      nNu++;
      return { id: f.id ?? '', weight: options.map((os) => Int32Array.from(os, (o) => o.reduce((m, sh) => m + (w.get(sh) ?? 0), 0))), table };
    });
    // people with the same choices, windows and rest rules share one transition structure
    // (transitions do not depend on μ, ν: only the gains do)
    const mine = new Set(myShifts.keys());
    const sig = JSON.stringify([
      options,
      window.map((wf) => [wf.first, wf.last, [...wf.w], Array.from({ length: countingMaxSum(wf.f) + 1 }, (_, t) => countingScoreAt(wf.f, t))]),
      [...conflicts[p]!].filter((k) => mine.has(Math.floor(k / nShifts)) && mine.has(k % nShifts)).sort((x, y) => x - y),
      [...pairPenalty[p]!].filter(([k]) => mine.has(Math.floor(k / nShifts)) && mine.has(k % nShifts)).sort((x, y) => x[0] - y[0]),
      restWindows[p]!.map((rw) => [rw.first, rw.last, rw.choices.map((c) => [[...c.shifts].sort((x, y) => x - y), c.score])]),
    ]);
    let tr = shared.get(sig);
    if (!tr) {
      const built = ((): Transitions | null => {
        // states: the options of the last `lookback` days, most recent first, as a base-K code
        // (digit k = option index on day d − 1 − k); transitions with their fixed scores
        const K = Math.max(...options.map((os) => os.length), 1);
        const KL = K ** (lookback - 1);
        if (K ** lookback > 2 ** 40) return null;
        const pow = Array.from({ length: lookback + 1 }, (_, k) => K ** k);
        const digit = (code: number, k: number) => Math.floor(code / pow[k]!) % K;
        const from: Int32Array[] = [], opt: Uint8Array[] = [], to: Int32Array[] = [], fixed: Float64Array[] = [], nStates: number[] = [];
        let prevCodes: number[] = [0];
        for (let d = 0; d < days; d++) {
          const index = new Map<number, number>();
          const nextCodes: number[] = [];
          const F: number[] = [], O: number[] = [], T: number[] = [], X: number[] = [];
          const os = options[d]!;
          // per option: score against each earlier day's option (conflict → −∞), precomputed
          const against: Float64Array[][] = os.map((o) =>
            Array.from({ length: Math.min(lookback, d) }, (_, k1) =>
              Float64Array.from(options[d - 1 - k1]!, (prev) => {
                let sc = 0;
                for (const a of o)
                  for (const b of prev) {
                    const key = pairKey(a, b);
                    if (conflicts[p]!.has(key)) return NEG;
                    sc += pairPenalty[p]!.get(key) ?? 0;
                  }
                return sc;
              }),
            ),
          );
          const inDay = os.map((o) => {
            let sc = 0;
            for (let i = 0; i < o.length; i++) for (let j = i + 1; j < o.length; j++) sc += pairPenalty[p]!.get(pairKey(o[i]!, o[j]!)) ?? 0;
            return sc;
          });
          const wfs = windowsByLast[d]!;
          const rws = restByLast[d]!;
          prevCodes.forEach((code, si) => {
            for (let oi = 0; oi < os.length; oi++) {
              let score = inDay[oi]!;
              const ag = against[oi]!;
              for (let k = 0; k < ag.length; k++) score += ag[k]![digit(code, k)]!;
              if (score === NEG) continue;
              for (const wf of wfs) {
                let sum = wf.weights[0]![oi]!;
                for (let k = 1; k < wf.span; k++) sum += wf.weights[k]![digit(code, k - 1)]!;
                score += wf.table[sum < wf.table.length ? sum : wf.table.length - 1]!;
              }
              for (const rw of rws) {
                let best = NEG;
                for (let j = 0; j < rw.scores.length; j++) {
                  if (rw.scores[j]! <= best) continue;
                  const b = rw.blocked[j]!;
                  let free = b[0]![oi] === 0;
                  for (let k = 1; free && k < rw.span; k++) free = b[k]![digit(code, k - 1)] === 0;
                  if (free) best = rw.scores[j]!;
                }
                score += best;
              }
              if (score === NEG) continue;
              const nc = oi + K * (code % KL);
              let ti = index.get(nc);
              if (ti === undefined) {
                ti = nextCodes.length;
                index.set(nc, ti);
                nextCodes.push(nc);
              }
              F.push(si);
              O.push(oi);
              T.push(ti);
              X.push(score);
            }
          });
          from.push(Int32Array.from(F));
          opt.push(Uint8Array.from(O));
          to.push(Int32Array.from(T));
          fixed.push(Float64Array.from(X));
          nStates.push(nextCodes.length);
          prevCodes = nextCodes;
        }
        // 60 people × 13 weeks: 6.5 M transitions, every day under 65,536 states (halves from and to)
        if (Math.max(1, ...nStates) < 65_536) return { from: from.map((a) => Uint16Array.from(a)), opt, to: to.map((a) => Uint16Array.from(a)), fixed, nStates };
        return { from, opt, to, fixed, nStates };
      })();
      if (!built) return { unsupported: 'person schedule states too many to encode' };
      tr = built;
      shared.set(sig, tr);
      totalTransitions += tr.from.reduce((m, f) => m + f.length, 0);
      if (totalTransitions > maxTransitions) return { unsupported: 'person schedules too many to enumerate by day' };
    }
    const { from, opt, to, fixed, nStates } = tr;
    const plan: PersonPlan = { p, days, options, seatsOfShift: myShifts, period: periodF, from, opt, to, fixed, nStates };
    // the largest sum each relaxed factor can reach under the person's hard rules: the conjugate
    // only needs t up to there (f(S) ≤ max_{t ≤ Tmax} [f(t) − νt] + νS for every reachable S)
    periodF.forEach((pf, j) => (pf.tmax = Math.min(pf.table.length - 1, maxReachable(plan, j))));
    people.push(plan);
  }
  return { compiled, domains, relaxedAux: auxLeftOut, people, shifts, constant, muIndex, nMu, nNu, lookback };
}

/** Multipliers of a run, keyed by names that survive recompiling the roster (a warm start for the next run). */
export interface DualStart {
  /** `${shiftId}|${personId}` → μ. */
  mu: Record<string, number>;
  /** period factor id (`term:detail`) → ν. */
  nu: Record<string, number>;
}

/** Name of each μ: the (shift, person) it prices. */
export function multiplierKeys(setup: LagrangianSetup): string[] {
  const { roster } = setup.compiled;
  const domains = setup.domains;
  const out: string[] = new Array(setup.nMu);
  domains.forEach((d, s) =>
    d.forEach((p, x) => {
      const q = setup.muIndex[s]![x]!;
      if (q >= 0) out[q] = `${roster.seats[s]!.shift}|${roster.people[p]!.id}`;
    }),
  );
  return out;
}

/** Multipliers by name (zeros left out). */
export function dualOf(setup: LagrangianSetup, mu: Float64Array, nu: Float64Array[]): DualStart {
  const keys = multiplierKeys(setup);
  const out: DualStart = { mu: {}, nu: {} };
  for (let q = 0; q < setup.nMu; q++) if (mu[q] !== 0) out.mu[keys[q]!] = mu[q]!;
  setup.people.forEach((pp, i) => pp.period.forEach((pf, j) => nu[i]![j] !== 0 && (out.nu[pf.id] = nu[i]![j]!)));
  return out;
}

/** Named multipliers of an earlier run into this setup's arrays (unknown names start at 0). */
export function applyDual(setup: LagrangianSetup, d: DualStart, mu: Float64Array, nu: Float64Array[]): void {
  const keys = multiplierKeys(setup);
  for (let q = 0; q < setup.nMu; q++) mu[q] = d.mu[keys[q]!] ?? 0;
  setup.people.forEach((pp, i) => pp.period.forEach((pf, j) => (nu[i]![j] = d.nu[pf.id] ?? 0)));
}

/** Multipliers and step state of a subgradient run; pass it back in to continue. */
export interface LagrangianState {
  mu: Float64Array;
  nu: Float64Array[];
  /** Lowest L so far: a proven upper bound on the model's best score. */
  best: number;
  /** The people's seats at the best L (for decoding a roster). */
  schedules: number[][];
  /** Multipliers at the best L (a warm start for a later run: lagrangianDual). */
  bestMu?: Float64Array;
  bestNu?: Float64Array[];
  step: number;
  sinceImprove: number;
  iterations: number;
  /** Previous (deflected) direction. */
  dMu?: Float64Array;
  dNu?: Float64Array[];
}

export function newLagrangianState(setup: LagrangianSetup): LagrangianState {
  return { mu: new Float64Array(setup.nMu), nu: setup.people.map((pp) => new Float64Array(pp.period.length)), best: Infinity, schedules: [], step: 1, sinceImprove: 0, iterations: 0 };
}

/** A shift side solution: the value of every seat of the shift, its own score (no μ) and its μ indices. */
export interface ShiftColumn {
  shift: number;
  values: number[];
  score: number;
  mus: number[];
}

/** A person side solution: the seats taken, the score of the exact (window) part, the sums of the relaxed period factors and the μ indices. */
export interface PersonColumn {
  person: number;
  seats: number[];
  score: number;
  sums: number[];
  mus: number[];
}

/** Columns collected by evaluateLagrangian (the pricing problems of column generation). */
export interface Columns {
  shifts: ShiftColumn[];
  people: PersonColumn[];
}

/**
 * One evaluation of L(μ, ν) with its subgradient (gMu = y − x, gNu = S(y) − t*). With `cols`,
 * each subproblem's maximiser is also pushed there as a column (shift index / person plan index).
 */
export function evaluateLagrangian(setup: LagrangianSetup, mu: Float64Array, nu: Float64Array[], gMu: Float64Array, gNu: Float64Array[], cols?: Columns): { L: number; schedules: number[][] } {
  gMu.fill(0);
  let L = setup.constant;
  setup.shifts.forEach((sp, sh) => (L += solveShift(setup, sp, mu, gMu, cols ? (values, score, mus) => cols.shifts.push({ shift: sh, values, score, mus }) : undefined)));
  const schedules: number[][] = [];
  setup.people.forEach((pp, i) => {
    const r = solvePerson(setup, pp, mu, nu[i]!, gMu, gNu[i]!);
    L += r.value;
    schedules.push(r.seats);
    cols?.people.push({ person: i, seats: r.seats, score: r.fixed, sums: r.sums, mus: r.mus });
  });
  return { L, schedules };
}

/** Steps on the diagonal scale of ν relative to μ (a preconditioner; any ν gives a valid bound). */
export const NU_SCALE = 0.1;
/**
 * Halve the step after this many evaluations without a new best: one per ~28 multipliers, between
 * 8 and 50. Measured on the demo (1,391 μ), 12 s of steps: patience 8 froze at 70 (step ~5e-4),
 * 30 reached 44.3, 50 reached 31.9 (42.3 after 4 s); 100 starts slower (79 after 6 s).
 */
const PATIENCE_MIN = 8;
const PATIENCE_MAX = 50;
const MU_PER_PATIENCE = 28;
/** Weight of the previous direction in the deflected subgradient. */
const DEFLECTION = 0.7;

/**
 * Subgradient descent on L(μ, ν) with Polyak steps toward `target` (a known feasible score; without
 * one, 1 % below the best bound), until `deadline` (by `now`) or maxIterations more evaluations.
 * Every L is an upper bound; state.best keeps the lowest.
 */
export function lagrangianSteps(setup: LagrangianSetup, state: LagrangianState, o: { deadline: number; now: () => number; target?: number; maxIterations?: number; patience?: number; deflection?: number }): LagrangianState {
  const gMu = new Float64Array(setup.nMu);
  const gNu = setup.people.map((pp) => new Float64Array(pp.period.length));
  const maxIt = o.maxIterations ?? Infinity;
  const patience = o.patience ?? Math.min(PATIENCE_MAX, Math.max(PATIENCE_MIN, Math.round(setup.nMu / MU_PER_PATIENCE)));
  for (let k = 0; k < maxIt; k++) {
    if (k > 0 && o.now() > o.deadline) break;
    const { L, schedules } = evaluateLagrangian(setup, state.mu, state.nu, gMu, gNu);
    state.iterations++;
    if (L < state.best) {
      if (L < state.best - 1e-9 * Math.max(1, Math.abs(state.best))) state.sinceImprove = 0;
      state.best = L;
      state.schedules = schedules;
      state.bestMu ??= new Float64Array(setup.nMu);
      state.bestNu ??= setup.people.map((pp) => new Float64Array(pp.period.length));
      state.bestMu.set(state.mu);
      state.nu.forEach((v, i) => state.bestNu![i]!.set(v));
    } else state.sinceImprove++;
    if (state.sinceImprove >= patience) {
      state.step *= 0.5;
      state.sinceImprove = 0;
    }
    // deflected direction d = g + β d_prev (β ≤ 1/2): damps the zig-zag of plain subgradient steps
    const beta = o.deflection ?? DEFLECTION;
    if (beta > 0) {
      state.dMu ??= new Float64Array(setup.nMu);
      state.dNu ??= setup.people.map((pp) => new Float64Array(pp.period.length));
      for (let q = 0; q < gMu.length; q++) gMu[q] = state.dMu[q] = gMu[q]! + beta * state.dMu[q]!;
      gNu.forEach((g, i) => {
        const dn = state.dNu![i]!;
        for (let q = 0; q < g.length; q++) g[q] = dn[q] = g[q]! + beta * dn[q]!;
      });
    }
    let norm = 0;
    for (let q = 0; q < gMu.length; q++) norm += gMu[q]! * gMu[q]!;
    for (const g of gNu) for (let q = 0; q < g.length; q++) norm += NU_SCALE * g[q]! * g[q]!;
    if (norm === 0) break; // both sides agree: L is the relaxation's optimum
    const target = o.target !== undefined && o.target < state.best ? o.target : state.best - Math.max(1, Math.abs(state.best) * 0.01);
    const alpha = (state.step * (L - target)) / norm;
    // ∂L/∂μ = y − x: μ ← μ − α g (a seat taking p that p does not take raises p's price there)
    for (let q = 0; q < state.mu.length; q++) state.mu[q] -= alpha * gMu[q]!;
    state.nu.forEach((v, i) => {
      const g = gNu[i]!;
      for (let q = 0; q < v.length; q++) v[q] -= alpha * NU_SCALE * g[q]!;
    });
  }
  return state;
}

/** Shift side: max over the shift's seats of Σ (unary − μ) + mixed factors; gMu −= chosen. */
function solveShift(setup: LagrangianSetup, sp: ShiftPlan, mu: Float64Array, gMu: Float64Array, emit?: (values: number[], score: number, mus: number[]) => void): number {
  const n = sp.seats.length;
  const muIndex = setup.muIndex;
  const domains = setup.domains;
  if (sp.mixed.length === 0) {
    let total = 0;
    const values: number[] = [], mus: number[] = [];
    let own = 0;
    for (let i = 0; i < n; i++) {
      const s = sp.seats[i]!;
      let bx = -1, bv = NEG;
      for (const x of sp.values[i]!) {
        const mi = muIndex[s]![x]!;
        const v = sp.unary[i]![x]! - (mi >= 0 ? mu[mi]! : 0);
        if (v > bv) (bv = v), (bx = x);
      }
      if (bx < 0) return NEG;
      total += bv;
      const mi = muIndex[s]![bx]!;
      if (mi >= 0) (gMu[mi] -= 1), mus.push(mi);
      values.push(bx);
      own += sp.unary[i]![bx]!;
    }
    emit?.(values, own, mus);
    return total;
  }
  // DP over seats; state code = sums of the mixed factors (capped, mixed radix) + mask of tracked keys used
  const m = sp.mixed.length;
  const radix = sp.mixed.map((f) => f.cap + 1);
  const place: number[] = [];
  let M = 1;
  for (let j = 0; j < m; j++) (place[j] = M), (M *= radix[j]!);
  const nStates = M << sp.tracked.size;
  let V = new Float64Array(nStates).fill(NEG);
  V[0] = 0;
  const backPrev: Int32Array[] = [];
  const backX: Int32Array[] = [];
  for (let i = 0; i < n; i++) {
    const s = sp.seats[i]!;
    const W = new Float64Array(nStates).fill(NEG);
    const BP = new Int32Array(nStates).fill(-1);
    const BX = new Int32Array(nStates).fill(-1);
    const vals = sp.values[i]!;
    // per value: its score, the bit of its key, its weights per mixed factor
    const vScore = vals.map((x) => {
      const mi = muIndex[s]![x]!;
      return sp.unary[i]![x]! - (mi >= 0 ? mu[mi]! : 0);
    });
    const vBit = vals.map((x) => sp.tracked.get(domains[s]![x]!) ?? -1);
    const vW = vals.map((x) => sp.mixed.map((f) => f.weights[i]!.get(x) ?? 0));
    for (let code = 0; code < nStates; code++) {
      const base = V[code]!;
      if (base === NEG) continue;
      const mask = Math.floor(code / M);
      const sumsCode = code % M;
      for (let q = 0; q < vals.length; q++) {
        let nm = mask;
        const bit = vBit[q]!;
        if (bit >= 0) {
          if (mask & (1 << bit)) continue;
          nm |= 1 << bit;
        }
        let nsCode = 0;
        const w = vW[q]!;
        for (let j = 0; j < m; j++) {
          const t = Math.floor(sumsCode / place[j]!) % radix[j]!;
          const u = t + w[j]!;
          nsCode += (u > radix[j]! - 1 ? radix[j]! - 1 : u) * place[j]!;
        }
        const nc = nsCode + nm * M;
        const v = base + vScore[q]!;
        if (v > W[nc]!) {
          W[nc] = v;
          BP[nc] = code;
          BX[nc] = vals[q]!;
        }
      }
    }
    V = W;
    backPrev.push(BP);
    backX.push(BX);
  }
  let bestCode = -1, bestV = NEG;
  for (let code = 0; code < nStates; code++) {
    if (V[code] === NEG) continue;
    let v = V[code]!;
    const sumsCode = code % M;
    for (let j = 0; j < m; j++) v += sp.mixed[j]!.table[Math.floor(sumsCode / place[j]!) % radix[j]!]!;
    if (v > bestV) (bestV = v), (bestCode = code);
  }
  if (bestV === NEG) return NEG;
  let code = bestCode;
  const values: number[] = new Array(n), mus: number[] = [];
  let own = bestV;
  for (let i = n - 1; i >= 0; i--) {
    const x = backX[i]![code]!;
    const mi = muIndex[sp.seats[i]!]![x]!;
    if (mi >= 0) (gMu[mi] -= 1), (own += mu[mi]!), mus.push(mi);
    values[i] = x;
    code = backPrev[i]![code]!;
  }
  emit?.(values, own, mus);
  return bestV;
}

/**
 * The shift side's column for given seat values of shift `sh` (e.g. a known roster's): its own
 * score (unaries, majorants, the mixed factors kept in the DP) and μ indices; null when a value
 * is one the shift side excludes (a hard unary).
 */
export function shiftColumnOf(setup: LagrangianSetup, sh: number, x: ArrayLike<number>): ShiftColumn | null {
  const sp = setup.shifts[sh]!;
  let score = 0;
  const values: number[] = [], mus: number[] = [];
  const sums = sp.mixed.map(() => 0);
  for (let i = 0; i < sp.seats.length; i++) {
    const s = sp.seats[i]!;
    const v = x[s]!;
    if (!sp.values[i]!.includes(v)) return null;
    values.push(v);
    score += sp.unary[i]![v]!;
    const q = setup.muIndex[s]![v]!;
    if (q >= 0) mus.push(q);
    sp.mixed.forEach((f, j) => (sums[j] += f.weights[i]!.get(v) ?? 0));
  }
  sp.mixed.forEach((f, j) => (score += f.table[Math.min(sums[j]!, f.cap)]!));
  return { shift: sh, values, score, mus };
}

/** Largest sum of period factor j over the person's schedules that keep every hard rule. */
function maxReachable(pp: PersonPlan, j: number): number {
  let V = new Float64Array(1);
  for (let d = 0; d < pp.days; d++) {
    const W = new Float64Array(pp.nStates[d]!).fill(NEG);
    const F = pp.from[d]!, O = pp.opt[d]!, T = pp.to[d]!, X = pp.fixed[d]!, w = pp.period[j]!.weight[d]!;
    for (let k = 0; k < F.length; k++) {
      if (X[k] === NEG) continue;
      const v = V[F[k]!]! + w[O[k]!]!;
      if (v > W[T[k]!]!) W[T[k]!] = v;
    }
    V = W;
  }
  let m = 0;
  for (let s = 0; s < V.length; s++) if (V[s]! > m) m = V[s]!;
  return Math.floor(m);
}

/** Person side: best schedule by DP over days; gMu += chosen seats; gNu = S(y) − t*. */
function solvePerson(setup: LagrangianSetup, pp: PersonPlan, mu: Float64Array, nu: Float64Array, gMu: Float64Array, gNu: Float64Array): { value: number; seats: number[]; fixed: number; sums: number[]; mus: number[] } {
  const muIndex = setup.muIndex;
  // conjugate constants: max_t f(t) − ν t, and its argmax
  let value = 0;
  const tStar: number[] = [];
  pp.period.forEach((pf, j) => {
    let bv = NEG, bt = 0;
    const tmax = pf.tmax ?? pf.table.length - 1;
    for (let t = 0; t <= tmax; t++) {
      const v = pf.table[t]! - nu[j]! * t;
      if (v > bv) (bv = v), (bt = t);
    }
    value += bv;
    tStar.push(bt);
  });
  // per (day, option): gain = Σ over its shifts of the best μ among the person's seats + ν·weights
  const days = pp.days;
  const bestSeat: number[][][] = [];
  const gain: Float64Array[] = [];
  for (let d = 0; d < days; d++) {
    const os = pp.options[d]!;
    const g = new Float64Array(os.length);
    const seatsChosen: number[][] = [];
    os.forEach((o, oi) => {
      let v = 0;
      const chosen: number[] = [];
      for (const sh of o) {
        let bm = NEG, bs = -1;
        for (const { seat, value: x } of pp.seatsOfShift.get(sh)!) {
          const mi = muIndex[seat]![x]!;
          const m = mi >= 0 ? mu[mi]! : NEG;
          if (m > bm) (bm = m), (bs = seat);
        }
        v += bm;
        chosen.push(bs);
      }
      pp.period.forEach((pf, j) => (v += nu[j]! * pf.weight[d]![oi]!));
      g[oi] = v;
      seatsChosen.push(chosen);
    });
    gain.push(g);
    bestSeat.push(seatsChosen);
  }
  // forward DP with back-pointers (transition index per state)
  let V = new Float64Array(1);
  const back: Int32Array[] = [];
  for (let d = 0; d < days; d++) {
    const ns = pp.nStates[d]!;
    const W = new Float64Array(ns).fill(NEG);
    const B = new Int32Array(ns).fill(-1);
    const F = pp.from[d]!, O = pp.opt[d]!, T = pp.to[d]!, X = pp.fixed[d]!, g = gain[d]!;
    for (let k = 0; k < F.length; k++) {
      const v = V[F[k]!]! + X[k]! + g[O[k]!]!;
      if (v > W[T[k]!]!) {
        W[T[k]!] = v;
        B[T[k]!] = k;
      }
    }
    V = W;
    back.push(B);
  }
  let bs = -1, bv = NEG;
  for (let s = 0; s < V.length; s++) if (V[s]! > bv) (bv = V[s]!), (bs = s);
  if (days === 0) bv = 0;
  value += bv;
  const seats: number[] = [];
  const mus: number[] = [];
  const sums = new Array<number>(pp.period.length).fill(0);
  let fixed = 0;
  for (let d = days - 1; d >= 0 && bs >= 0; d--) {
    const k = back[d]![bs]!;
    const oi = pp.opt[d]![k]!;
    fixed += pp.fixed[d]![k]!;
    for (const seat of bestSeat[d]![oi]!) {
      seats.push(seat);
      const x = setup.domains[seat]!.indexOf(pp.p);
      const mi = muIndex[seat]![x]!;
      if (mi >= 0) (gMu[mi] += 1), mus.push(mi);
    }
    pp.period.forEach((pf, j) => (sums[j] += pf.weight[d]![oi]!));
    bs = pp.from[d]![k]!;
  }
  pp.period.forEach((_, j) => (gNu[j] = sums[j]! - tStar[j]!));
  return { value, seats, fixed, sums, mus };
}
