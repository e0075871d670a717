/**
 * Large-neighbourhood search on a compiled roster: free a neighbourhood (every seat of a few
 * days, or every seat k people hold plus the open seats they could take), keep everyone and
 * everything else fixed, and re-plan the neighbourhood EXACTLY as a small MIP (HiGHS, the
 * encoding of solver/bench/highs-mip.ts) started from the current roster. Moves are whole
 * schedules and whole days at once, which the one- and two-seat moves of local search cannot
 * make (a pairing, the weekly rest and contracted hours pull several seats together).
 *
 * The sub-model is the model conditioned on the fixed values: factors with no free variable
 * become a constant, factors with one free variable a unary, counting factors keep their free
 * part with the fixed part's sum as an offset, all-different forbids the keys fixed variables
 * hold. So the sub-model's score of any completion equals the whole model's score of it; every
 * accepted move is checked with the whole model's scorer anyway, and the MIP start means HiGHS
 * never returns a worse roster than the one it was given.
 *
 * Neighbourhoods are chosen by where the roster concedes (the factors below their own best,
 * attributed to their days and people) or, given Lagrangian multipliers, by where the relaxed
 * person and shift subproblems disagree most with the roster (see `priorities`). Deterministic for
 * a seed: HiGHS gets a node limit, not a time limit, as its work cap (the time limit is a safety
 * net only).
 */
import type { CountingFactor, Factor, Model, Variable } from '../model';
import { countingMaxSum, countingScoreAt, factorScore, factorsByVariable, keyOf, score as modelScore } from '../model';
import { encodeMip, readMipAssignment, setMipStart } from '../bench/highs-mip';
import { OPEN, type CompiledRoster } from './compile';
import type { HighsRuntime } from './bound/highs';

/** The calls of the persistent HiGHS model this module uses. */
type HighsMip = {
  options: { set(values: Record<string, unknown>): unknown };
  info: { get(name: string): number | bigint };
  run(): { modelStatus: number };
  getSolution(): { colValue: Float64Array };
  getColByName(name: string): number;
  setSolution(s: { indices: Int32Array; values: Float64Array }): unknown;
  dispose(): void;
};

export interface SubProblem {
  model: Model;
  /** Model variable of each sub-model variable. */
  vars: number[];
  /** values[k][j] = the model value of value j of sub-model variable k. */
  values: number[][];
  /** The current values as sub-model values. */
  start: number[];
}

/**
 * The model with every variable outside `free` fixed at its value in x. `allow(i, v)` limits the
 * values a free variable may take (its current value is always allowed). Null when a factor of a
 * kind this conditioning does not handle has two or more free variables.
 */
export function conditionModel(model: Model, byVar: number[][], x: ArrayLike<number>, free: number[], allow?: (i: number, v: number) => boolean, current?: number): SubProblem | null {
  const nv = model.variables.length;
  const pos = new Int32Array(nv).fill(-1);
  free.forEach((i, k) => (pos[i] = k));
  const values: number[][] = [];
  const subIndex: Int32Array[] = [];
  const variables: Variable[] = free.map((i, k) => {
    const v = model.variables[i]!;
    const list: number[] = [];
    const idx = new Int32Array(v.cardinality).fill(-1);
    for (let a = 0; a < v.cardinality; a++) if (a === x[i] || !allow || allow(i, a)) (idx[a] = list.length), list.push(a);
    values.push(list);
    subIndex.push(idx);
    void k;
    return { name: v.name, cardinality: list.length, keys: Int32Array.from(list, (a) => keyOf(v, a)) };
  });
  const seen = new Uint8Array(model.factors.length);
  const touched: number[] = [];
  for (const i of free) for (const fi of byVar[i]!) if (!seen[fi]) (seen[fi] = 1), touched.push(fi);
  const factors: Factor[] = [];
  // the untouched factors' part of the current score (from the whole score when the caller knows it)
  let constant = 0;
  if (current !== undefined && Number.isFinite(current)) {
    constant = current;
    for (const fi of touched) constant -= factorScore(model, model.factors[fi]!, x);
  } else {
    constant = model.constant ?? 0;
    for (let fi = 0; fi < model.factors.length; fi++) if (!seen[fi]) constant += factorScore(model, model.factors[fi]!, x);
  }
  const xs = Int32Array.from(x as ArrayLike<number>);
  const unaryOf = (f: Factor, i: number): Float64Array => {
    const k = pos[i]!;
    const t = new Float64Array(values[k]!.length);
    const keep = xs[i]!;
    values[k]!.forEach((a, j) => {
      xs[i] = a;
      t[j] = factorScore(model, f, xs);
    });
    xs[i] = keep;
    return t;
  };
  for (const fi of touched) {
    const f = model.factors[fi]!;
    const scope = f.kind === 'unary' ? [f.v] : f.kind === 'pairwise' || f.kind === 'sameKey' || f.kind === 'sparsePair' ? [f.a, f.b] : f.vars;
    const freeVars = scope.filter((i) => pos[i]! >= 0);
    if (freeVars.length === 1 && f.kind !== 'counting') {
      factors.push({ kind: 'unary', v: pos[freeVars[0]!]!, table: unaryOf(f, freeVars[0]!), hard: f.hard, id: f.id });
      continue;
    }
    switch (f.kind) {
      case 'counting': {
        let s0 = 0;
        const vars: number[] = [];
        const weights: [number, number][][] = [];
        f.vars.forEach((i, j) => {
          const w = f.weights[j]!;
          if (pos[i]! < 0) {
            for (const [val, wt] of w) if (val === x[i]) s0 += wt;
            return;
          }
          const sub: [number, number][] = [];
          for (const [val, wt] of w) {
            const a = subIndex[pos[i]!]![val]!;
            if (a >= 0 && wt > 0) sub.push([a, wt]);
          }
          if (sub.length) vars.push(pos[i]!), weights.push(sub);
        });
        const maxFree = countingMaxSum({ weights } as CountingFactor);
        const table = new Float64Array(maxFree + 1);
        let varies = false;
        for (let t = 0; t <= maxFree; t++) {
          table[t] = countingScoreAt(f as CountingFactor, s0 + t);
          if (table[t] !== table[0]) varies = true;
        }
        if (!varies) constant += table[0]!;
        else factors.push({ kind: 'counting', vars, weights, score: table, hard: f.hard, id: f.id });
        break;
      }
      case 'allDifferent': {
        const penalty = f.penalty ?? -Infinity;
        const held = new Map<number, number>();
        for (const i of f.vars) {
          if (pos[i]! >= 0) continue;
          const k = keyOf(model.variables[i]!, x[i]!);
          if (k >= 0) held.set(k, (held.get(k) ?? 0) + 1);
        }
        for (const c of held.values()) if (c > 1) constant += penalty * ((c * (c - 1)) / 2);
        const freeSub = f.vars.filter((i) => pos[i]! >= 0);
        for (const i of freeSub) {
          const k = pos[i]!;
          const t = new Float64Array(values[k]!.length);
          let any = false;
          values[k]!.forEach((a, j) => {
            const c = held.get(keyOf(model.variables[i]!, a)) ?? 0;
            if (keyOf(model.variables[i]!, a) >= 0 && c > 0) (t[j] = penalty * c), (any = true);
          });
          if (any) factors.push({ kind: 'unary', v: k, table: t, hard: penalty === -Infinity || undefined, id: f.id });
        }
        if (freeSub.length >= 2) factors.push({ kind: 'allDifferent', vars: freeSub.map((i) => pos[i]!), penalty: f.penalty, hard: f.hard, id: f.id });
        break;
      }
      case 'sameKey':
        factors.push({ ...f, a: pos[f.a]!, b: pos[f.b]! });
        break;
      case 'pairwise': {
        const A = values[pos[f.a]!]!, B = values[pos[f.b]!]!;
        const kb = model.variables[f.b]!.cardinality;
        const table = new Float64Array(A.length * B.length);
        A.forEach((a, ia) => B.forEach((b, ib) => (table[ia * B.length + ib] = f.table[a * kb + b]!)));
        factors.push({ kind: 'pairwise', a: pos[f.a]!, b: pos[f.b]!, table, hard: f.hard, id: f.id });
        break;
      }
      case 'unary':
        break; // one free variable: handled above
      default:
        return null;
    }
  }
  const start = free.map((i, k) => subIndex[k]![x[i]!]!);
  return { model: { variables, factors, constant, name: 'neighbourhood' }, vars: free, values, start };
}

export interface Neighbourhood {
  /** Free model variables (seats, then aux). */
  free: number[];
  /** Values a free variable may take (undefined: all). */
  allow?: (i: number, v: number) => boolean;
  label: string;
}

export interface LnsStats {
  moves: number;
  improved: number;
  /** Sub-MIPs HiGHS could not solve within its limits (kept the roster). */
  unsolved: number;
  /** CPU/clock ms spent in HiGHS. */
  solveMs: number;
}

export interface LnsOptions {
  deadline: number;
  now: () => number;
  seed?: number;
  /** Branch-and-bound nodes HiGHS may use per neighbourhood (its deterministic work cap). */
  maxNodes?: number;
  /** Called with every improved roster. */
  onImprove?: (x: Int32Array, score: number) => void;
  /** Priority per day and per person (higher: try there first); default: the roster's own concessions. */
  priorities?: { days: Float64Array; people: Float64Array };
}

/** Days of each seat variable and the aux variables' windows, the structure neighbourhoods are made of. */
export interface RosterLayout {
  days: number;
  seatDay: Int32Array;
  seatsOnDay: number[][];
  auxOfPerson: number[][];
  /** Aux variables whose window holds the day. */
  auxOnDay: number[][];
  byVar: number[][];
}

export function rosterLayout(compiled: CompiledRoster): RosterLayout {
  const { roster, facts } = compiled;
  const shiftIdx = new Map(roster.shifts.map((s, i) => [s.id, i]));
  const nSeats = compiled.seatIds.length;
  const seatDay = Int32Array.from(roster.seats, (s) => facts[shiftIdx.get(s.shift)!]!.day);
  const days = facts.length ? Math.max(...facts.map((f) => f.day)) + 1 : 0;
  const seatsOnDay: number[][] = Array.from({ length: days }, () => []);
  for (let s = 0; s < nSeats; s++) seatsOnDay[seatDay[s]!]!.push(s);
  const auxOfPerson: number[][] = roster.people.map(() => []);
  const auxOnDay: number[][] = Array.from({ length: days }, () => []);
  for (const a of compiled.aux) {
    auxOfPerson[a.person]!.push(a.v);
    for (let d = Math.max(0, a.first); d <= Math.min(days - 1, a.last); d++) auxOnDay[d]!.push(a.v);
  }
  return { days, seatDay, seatsOnDay, auxOfPerson, auxOnDay, byVar: factorsByVariable(compiled.model) };
}

/** Every seat (and aux variable) of days first..last, all values allowed. */
export function dayNeighbourhood(L: RosterLayout, first: number, last: number): Neighbourhood {
  const seats: number[] = [];
  const aux = new Set<number>();
  for (let d = Math.max(0, first); d <= Math.min(L.days - 1, last); d++) {
    seats.push(...L.seatsOnDay[d]!);
    for (const v of L.auxOnDay[d]!) aux.add(v);
  }
  return { free: [...seats, ...[...aux].sort((a, b) => a - b)], label: `days ${first + 1}–${last + 1}` };
}

/**
 * The seats the given people hold and the open seats they could take (within days first..last),
 * their aux variables; each freed seat may take only those people, open, or its current value.
 */
export function peopleNeighbourhood(compiled: CompiledRoster, L: RosterLayout, x: ArrayLike<number>, people: number[], first = 0, last = L.days - 1): Neighbourhood {
  const inSet = new Set(people);
  const domains = compiled.domains;
  const free: number[] = [];
  for (let s = 0; s < compiled.seatIds.length; s++) {
    const d = L.seatDay[s]!;
    if (d < first || d > last) continue;
    const holder = domains[s]![x[s]!]!;
    if (inSet.has(holder) || (holder === OPEN && domains[s]!.some((p) => inSet.has(p)))) free.push(s);
  }
  for (const p of people) for (const v of L.auxOfPerson[p]!) {
    const a = compiled.aux[v - compiled.seatIds.length]!;
    if (a.last >= first && a.first <= last) free.push(v);
  }
  const nSeats = compiled.seatIds.length;
  return {
    free,
    allow: (i, v) => i >= nSeats || inSet.has(domains[i]![v]!) || domains[i]![v] === OPEN,
    label: `people ${people.join(',')}${first > 0 || last < L.days - 1 ? ` days ${first + 1}–${last + 1}` : ''}`,
  };
}

/**
 * Re-plan one neighbourhood exactly (within HiGHS's node limit). Returns the new assignment and its
 * score when it is better than `current`, else null.
 */
export function solveNeighbourhood(compiled: CompiledRoster, L: RosterLayout, highs: HighsRuntime, x0: Int32Array, current: number, nb: Neighbourhood, maxNodes: number): { x: Int32Array; score: number } | null | 'unsolved' {
  const model = compiled.model;
  const x = Int32Array.from(x0);
  const { free, blocked } = settleAux(compiled, x, nb.free);
  const nSeats = compiled.seatIds.length;
  const allow = (i: number, v: number) => (i >= nSeats ? !blocked.get(i)?.has(v) : nb.allow ? nb.allow(i, v) : true);
  const sub = conditionModel(model, L.byVar, x, free, allow, current + auxGain(compiled, x0, x));
  if (!sub) return 'unsolved';
  const enc = encodeMip(sub.model);
  const m = (highs as unknown as { createModel(s: { format: 'lp'; data: string }): HighsMip }).createModel({ format: 'lp', data: enc.lp });
  try {
    m.options.set({ output_flag: false, mip_max_nodes: maxNodes, time_limit: 30, mip_rel_gap: 0, mip_abs_gap: 1e-6 });
    setMipStart(enc, sub.model, m, sub.start);
    m.run();
    if (Number(m.info.get('primal_solution_status')) !== 2) return 'unsolved';
    const picked = readMipAssignment(enc, sub.model, m, m.getSolution().colValue, sub.start);
    const y = Int32Array.from(x);
    picked.forEach((best, k) => (y[sub.vars[k]!] = sub.values[k]![best]!));
    // the sub-model's score is the whole model's; the whole scorer has the last word
    const sc = modelScore(sub.model, Array.from(sub.vars, (i, k) => sub.values[k]!.indexOf(y[i]!)));
    if (!(sc > current + 1e-9)) return null;
    const exact = modelScore(model, y);
    return exact > current + 1e-9 ? { x: y, score: exact } : null;
  } finally {
    m.dispose();
  }
}

/**
 * Most freed aux variables do not depend on the neighbourhood: some choice as good as every other
 * needs only seats that stay fixed and are free of the person (their rest falls outside the freed
 * days). Those are set to that choice in x (never lowering its score: no choice scores more) and
 * left out of the sub-model, which keeps it a fraction of the size.
 */
/** Score change of setting aux variables from x0 to x (only unaries score aux values on their own). */
function auxGain(compiled: CompiledRoster, x0: ArrayLike<number>, x: ArrayLike<number>): number {
  let g = 0;
  for (const a of compiled.aux) if (x0[a.v] !== x[a.v]) g += a.choices[x[a.v]!]!.score - a.choices[x0[a.v]!]!.score;
  return g;
}

export function settleAux(compiled: CompiledRoster, x: Int32Array, free: number[]): { free: number[]; blocked: Map<number, Set<number>> } {
  const nSeats = compiled.seatIds.length;
  const freeSeat = new Uint8Array(nSeats);
  for (const i of free) if (i < nSeats) freeSeat[i] = 1;
  const out: number[] = [];
  // choices a fixed seat of the person already rules out: not offered to the sub-model
  const blocked = new Map<number, Set<number>>();
  for (const i of free) {
    if (i < nSeats) {
      out.push(i);
      continue;
    }
    const a = compiled.aux[i - nSeats]!;
    let top = -Infinity;
    const shut = new Set<number>();
    let settled = -1;
    a.choices.forEach((c, j) => {
      let touchesFree = false;
      for (let k = 0; k < c.seats.length; k++) {
        const s = c.seats[k]!;
        if (freeSeat[s]) touchesFree = true;
        else if (x[s] === compiled.valueOf(s, a.person)) return void shut.add(j);
      }
      if (c.score > top) top = c.score;
      if (!touchesFree && (settled < 0 || c.score > a.choices[settled]!.score)) settled = j;
    });
    if (settled >= 0 && a.choices[settled]!.score >= top) x[i] = settled;
    else {
      out.push(i);
      if (shut.size && !shut.has(x[i]!)) blocked.set(i, shut);
    }
  }
  return { free: out, blocked };
}

/** Small deterministic PRNG (mulberry32), kept here so the search does not depend on inference internals. */
function prng(seed: number): () => number {
  let a = seed >>> 0 || 0x9e3779b9;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Best finite value each factor can take (its own best), for concessions. */
function factorBests(model: Model): Float64Array {
  const out = new Float64Array(model.factors.length);
  model.factors.forEach((f, fi) => {
    let m = -Infinity;
    if (f.kind === 'counting') {
      const n = Math.min(countingMaxSum(f), typeof f.score === 'function' ? 10_000 : f.score.length - 1);
      for (let t = 0; t <= n; t++) m = Math.max(m, countingScoreAt(f, t));
    } else if (f.kind === 'unary' || f.kind === 'pairwise' || f.kind === 'table') for (const v of Array.from(f.table as ArrayLike<number>)) m = Math.max(m, v);
    else if (f.kind === 'sameKey') m = Math.max(0, f.weight);
    else if (f.kind === 'sparsePair') m = Math.max(f.default, ...f.entries.map((e) => e[2]));
    else m = 0;
    out[fi] = Number.isFinite(m) ? m : 0;
  });
  return out;
}

/**
 * Where the roster concedes: each soft factor's cost (own best − score) spread over the days of
 * its seats and the people who hold or could hold them (a factor over the whole period counts a
 * little on each day, a skill mix on its one day in full).
 */
export function concessionPriorities(compiled: CompiledRoster, L: RosterLayout, x: ArrayLike<number>, bests = factorBests(compiled.model)): { days: Float64Array; people: Float64Array } {
  const model = compiled.model;
  const nSeats = compiled.seatIds.length;
  const days = new Float64Array(L.days);
  const people = new Float64Array(compiled.roster.people.length);
  model.factors.forEach((f, fi) => {
    const cost = bests[fi]! - factorScore(model, f, x);
    if (!(cost > 1e-9) || !Number.isFinite(cost)) return;
    const scope = f.kind === 'unary' ? [f.v] : f.kind === 'pairwise' || f.kind === 'sameKey' || f.kind === 'sparsePair' ? [f.a, f.b] : f.vars;
    const seats = scope.filter((i) => i < nSeats);
    if (!seats.length) return;
    const dset = new Set(seats.map((s) => L.seatDay[s]!));
    for (const d of dset) days[d] += cost / dset.size;
    const who = new Set<number>();
    for (const s of seats) {
      const p = compiled.domains[s]![x[s]!]!;
      if (p !== OPEN) who.add(p);
    }
    if (!who.size) for (const s of seats) for (const p of compiled.domains[s]!) if (p !== OPEN) who.add(p);
    for (const p of who) people[p] += cost / who.size;
  });
  return { days, people };
}

export interface Lns {
  /** Score of x (the caller's array, improved in place). */
  readonly score: number;
  readonly stats: LnsStats;
  /** Re-plan neighbourhoods until the deadline; `priorities` (e.g. from the dual) replace the roster's own concessions for the rounds that start meanwhile. */
  run(o: { deadline: number; now: () => number; priorities?: { days: Float64Array; people: Float64Array } }): void;
}

/**
 * Improve x (in place) by re-planning neighbourhoods: rounds of windows of `width` days in order of
 * where the roster concedes most, then sets of people (the most conceding, with random partners),
 * widening both when a whole round finds nothing. Resumable: each run() goes on where the last
 * stopped.
 */
export function createLns(compiled: CompiledRoster, highs: HighsRuntime, x: Int32Array, o: { seed?: number; maxNodes?: number; width?: number; group?: number; peopleFirst?: boolean } = {}): Lns {
  const L = rosterLayout(compiled);
  const model = compiled.model;
  let current = modelScore(model, x);
  const stats: LnsStats = { moves: 0, improved: 0, unsolved: 0, solveMs: 0 };
  const random = prng((o.seed ?? 1) * 7919 + 17);
  const bests = factorBests(model);
  const maxNodes = o.maxNodes ?? 200;
  const nPeople = compiled.roster.people.length;
  let width = o.width ?? 2;
  let group = Math.min(o.group ?? 3, nPeople);
  let queue: (() => Neighbourhood)[] = [];
  let found = false;
  const plan = (pr: { days: Float64Array; people: Float64Array }) => {
    if (!found && stats.moves > 0) {
      width = Math.min(L.days, width + 1);
      group = Math.min(nPeople, group + 1);
    }
    found = false;
    const w = width, g = group;
    const weight = (d: number) => {
      let t = 0;
      for (let k = d; k < Math.min(L.days, d + w); k++) t += pr.days[k]!;
      return t;
    };
    const starts = Array.from({ length: Math.max(1, L.days - w + 1) }, (_, d) => d).filter((d) => weight(d) > 1e-9);
    starts.sort((a, b) => weight(b) - weight(a) || a - b);
    const order = Array.from({ length: nPeople }, (_, p) => p).sort((a, b) => pr.people[b]! - pr.people[a]! || a - b);
    const sets = order.slice(0, Math.max(1, Math.ceil(nPeople / 2))).map((p) => {
      const set = new Set([p]);
      while (set.size < g) set.add(Math.floor(random() * nPeople));
      return [...set];
    });
    const dayNbs = starts.map((d) => () => dayNeighbourhood(L, d, Math.min(L.days - 1, d + w - 1)));
    const peopleNbs = sets.map((set) => () => peopleNeighbourhood(compiled, L, x, set));
    queue = o.peopleFirst ? [...peopleNbs, ...dayNbs] : [...dayNbs, ...peopleNbs];
  };
  return {
    get score() {
      return current;
    },
    stats,
    run(r) {
      if (current === -Infinity || L.days === 0) return;
      // at least one neighbourhood per call: the caller slices time and a slice may be short
      do {
        if (!queue.length) plan(r.priorities ?? concessionPriorities(compiled, L, x, bests));
        if (!queue.length) return; // nothing conceded anywhere: x is at the ideal
        const nb = queue.shift()!();
        const t = r.now();
        const res = solveNeighbourhood(compiled, L, highs, x, current, nb, maxNodes);
        stats.solveMs += r.now() - t;
        stats.moves++;
        if (res === 'unsolved') stats.unsolved++;
        else if (res) {
          x.set(res.x);
          current = res.score;
          stats.improved++;
          found = true;
        }
      } while (r.now() < r.deadline);
    },
  };
}
