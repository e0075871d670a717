/**
 * Seeded generators of benchmark and test model families: Potts grids,
 * frustrated binary cycles, random binary graphs, roster-like seat models.
 */
import type { Factor, Model } from '../model/types';
import { rng } from '../inference/local-search';

/** W×H grid, K labels, random unaries in [-1,1], Potts coupling `coupling` (sameKey) on grid edges. */
export function pottsGrid(o: { w: number; h: number; k: number; coupling?: number; seed?: number }): Model {
  const r = rng(o.seed ?? 1);
  const J = o.coupling ?? 0.8;
  const variables = Array.from({ length: o.w * o.h }, (_, i) => ({ name: `g${i % o.w}_${Math.floor(i / o.w)}`, cardinality: o.k }));
  const factors: Factor[] = [];
  for (let i = 0; i < variables.length; i++) factors.push({ kind: 'unary', v: i, table: Array.from({ length: o.k }, () => r() * 2 - 1) });
  for (let y = 0; y < o.h; y++)
    for (let x = 0; x < o.w; x++) {
      const i = y * o.w + x;
      if (x + 1 < o.w) factors.push({ kind: 'sameKey', a: i, b: i + 1, weight: J });
      if (y + 1 < o.h) factors.push({ kind: 'sameKey', a: i, b: i + o.w, weight: J });
    }
  return { name: `potts-grid-${o.w}x${o.h}-k${o.k}`, variables, factors };
}

/** Ising-type binary pairwise model on given edges with couplings J (spin s = 2x-1) and fields h. */
export function binaryModel(name: string, n: number, edges: Array<[number, number, number]>, fields: number[]): Model {
  const variables = Array.from({ length: n }, (_, i) => ({ name: `s${i}`, cardinality: 2 }));
  const factors: Factor[] = [];
  fields.forEach((h, i) => {
    if (h !== 0) factors.push({ kind: 'unary', v: i, table: [-h, h] });
  });
  for (const [a, b, J] of edges) factors.push({ kind: 'pairwise', a, b, table: [J, -J, -J, J] });
  return { name, variables, factors };
}

/** A ring of n binary spins with couplings ±J, an odd number of them negative (frustrated). */
export function frustratedCycle(o: { n: number; seed?: number }): Model {
  const r = rng(o.seed ?? 1);
  const edges: Array<[number, number, number]> = [];
  let neg = 0;
  for (let i = 0; i < o.n; i++) {
    let J = 0.5 + r();
    if (r() < 0.5) {
      J = -J;
      neg++;
    }
    edges.push([i, (i + 1) % o.n, J]);
  }
  if (neg % 2 === 0) edges[0]![2] = -edges[0]![2];
  // chords make it a random graph rather than a plain ring
  return binaryModel(`frustrated-cycle-${o.n}`, o.n, edges, Array.from({ length: o.n }, () => (r() - 0.5) * 0.2));
}

/** Erdős–Rényi binary spin glass: n spins, each pair an edge with probability p, J ~ U[-1,1]. */
export function randomBinaryGraph(o: { n: number; degree: number; seed?: number }): Model {
  const r = rng(o.seed ?? 1);
  const p = o.degree / (o.n - 1);
  const edges: Array<[number, number, number]> = [];
  for (let a = 0; a < o.n; a++) for (let b = a + 1; b < o.n; b++) if (r() < p) edges.push([a, b, r() * 2 - 1]);
  return binaryModel(`random-graph-${o.n}-d${o.degree}`, o.n, edges, Array.from({ length: o.n }, () => r() * 2 - 1));
}

export interface RosterShape {
  people: number;
  days: number;
  shiftsPerDay: number;
  seatsPerShift: number;
  /** Fraction of people eligible for each seat (1 = everyone). */
  eligibility?: number;
  /** Pairing factors between neighbouring seats of a shift (sparse tables over people). */
  pairings?: boolean;
  /** One n-ary all-different per day ("one shift per day") instead of pairwise within shifts. */
  dayAllDifferent?: boolean;
  /** Weekly cap on shifts per person (counting factor, hard). */
  weeklyCap?: number;
  seed?: number;
}

/**
 * Roster-like seat model. Variables: seats; values: eligible people + "open" (key -1).
 * Factors: unary wishes and an open-seat penalty; all-different (no double booking)
 * within each shift (pairwise) or per day (n-ary); rest: nobody on a late shift and the
 * next day's early shift (sameKey -Infinity between seats); pairings (sparsePair);
 * optional weekly cap (counting).
 */
export function rosterModel(o: RosterShape): Model {
  const r = rng(o.seed ?? 1);
  const P = o.people, elig = o.eligibility ?? 1;
  const variables: Model['variables'] = [];
  const factors: Factor[] = [];
  const shiftSeats: number[][] = [];
  // wish of person p for shift type t on day d: mostly mild, some strong
  const wish = (p: number, d: number, t: number): number => {
    void p;
    void d;
    void t;
    const u = r();
    return u < 0.1 ? -3 : u < 0.2 ? 2 : (r() - 0.5) * 1;
  };
  for (let d = 0; d < o.days; d++)
    for (let t = 0; t < o.shiftsPerDay; t++) {
      const seats: number[] = [];
      for (let s = 0; s < o.seatsPerShift; s++) {
        const people: number[] = [];
        for (let p = 0; p < P; p++) if (elig >= 1 || r() < elig) people.push(p);
        const i = variables.length;
        variables.push({ name: `d${d}.t${t}.s${s}`, cardinality: people.length + 1, labels: [...people.map((p) => `p${p}`), 'open'], keys: [...people, -1] });
        const table = people.map((p) => 5 + wish(p, d, t));
        table.push(0); // open seat: no coverage reward
        factors.push({ kind: 'unary', v: i, table, id: `wish:${i}`, label: `wishes and coverage of ${variables[i]!.name}` });
        seats.push(i);
      }
      shiftSeats.push(seats);
      if (!o.dayAllDifferent)
        for (let a = 0; a < seats.length; a++)
          for (let b = a + 1; b < seats.length; b++) factors.push({ kind: 'allDifferent', vars: [seats[a]!, seats[b]!], id: `double:${seats[a]}:${seats[b]}` });
      if (o.pairings !== false)
        for (let a = 0; a + 1 < seats.length; a++) {
          const entries: Array<[number, number, number]> = [];
          for (let e = 0; e < 3; e++) {
            const p = Math.floor(r() * P), q = Math.floor(r() * P);
            if (p === q) continue;
            const sc = r() < 0.5 ? 2 : -2;
            entries.push([p, q, sc], [q, p, sc]);
          }
          factors.push({ kind: 'sparsePair', a: seats[a]!, b: seats[a + 1]!, entries, default: 0, id: `pair:${seats[a]}`, label: 'pairing' });
        }
    }
  const S = o.shiftsPerDay;
  for (let d = 0; d < o.days; d++) {
    if (o.dayAllDifferent) {
      const vars = shiftSeats.slice(d * S, d * S + S).flat();
      factors.push({ kind: 'allDifferent', vars, id: `day:${d}`, label: `one shift per day ${d}` });
    } else
      for (let t = 0; t + 1 < S; t++)
        for (const a of shiftSeats[d * S + t]!) for (const b of shiftSeats[d * S + t + 1]!) factors.push({ kind: 'allDifferent', vars: [a, b], id: `sameday:${a}:${b}` });
    if (d + 1 < o.days) {
      const late = shiftSeats[d * S + S - 1]!, early = shiftSeats[(d + 1) * S]!;
      if (o.dayAllDifferent) factors.push({ kind: 'allDifferent', vars: [...late, ...early], id: `rest:${d}`, label: `11 h rest after day ${d}` });
      else for (const a of late) for (const b of early) factors.push({ kind: 'sameKey', a, b, weight: -Infinity, id: `rest:${a}:${b}`, hard: true });
    }
  }
  if (o.weeklyCap !== undefined) {
    const cap = o.weeklyCap;
    for (let w = 0; w * 7 < o.days; w++)
      for (let p = 0; p < P; p++) {
        const vars: number[] = [], weights: Array<Array<[number, number]>> = [];
        for (let d = w * 7; d < Math.min(o.days, w * 7 + 7); d++)
          for (let t = 0; t < S; t++)
            for (const i of shiftSeats[d * S + t]!) {
              const x = (variables[i]!.keys as number[]).indexOf(p);
              if (x >= 0) {
                vars.push(i);
                weights.push([[x, 1]]);
              }
            }
        if (vars.length > cap) factors.push({ kind: 'counting', vars, weights, score: (s: number) => (s > cap ? -Infinity : s > cap - 1 ? -1 : 0), id: `week:${w}:p${p}`, label: `at most ${cap} shifts in week ${w + 1}` });
      }
  }
  return { name: `roster-${P}p-${variables.length}seats`, variables, factors };
}

/** Number of pairwise factors (pairwise, sameKey, sparsePair, 2-variable allDifferent). */
export function countPairwise(m: Model): number {
  return m.factors.filter((f) => f.kind === 'pairwise' || f.kind === 'sameKey' || f.kind === 'sparsePair' || (f.kind === 'allDifferent' && f.vars.length === 2)).length;
}

/**
 * ±J spin glass with fields (issue 14's UAI targets): couplings J_ab ∈ {−1, +1} with equal odds,
 * fields h_i uniform in [−field, field]; score Σ J_ab s_a s_b + Σ h_i s_i, s = 2x − 1.
 * `graph: 'torus'` is a w×h periodic grid (n = w·h, every spin on 4 edges, many frustrated
 * plaquettes), `'random'` an Erdős–Rényi graph with the given mean degree.
 */
export function spinGlass(o: { n: number; graph: 'torus' | 'random'; w?: number; degree?: number; field?: number; seed?: number }): Model {
  const r = rng(o.seed ?? 1);
  const edges: Array<[number, number, number]> = [];
  const sign = (): number => (r() < 0.5 ? -1 : 1);
  if (o.graph === 'torus') {
    const w = o.w ?? Math.round(Math.sqrt(o.n)), h = o.n / w;
    if (!Number.isInteger(h)) throw new Error(`spinGlass: ${o.n} spins do not fill rows of ${w}`);
    for (let y = 0; y < h; y++)
      for (let x = 0; x < w; x++) {
        const i = y * w + x;
        edges.push([i, y * w + ((x + 1) % w), sign()]);
        edges.push([i, ((y + 1) % h) * w + x, sign()]);
      }
  } else {
    const p = (o.degree ?? 4) / (o.n - 1);
    for (let a = 0; a < o.n; a++) for (let b = a + 1; b < o.n; b++) if (r() < p) edges.push([a, b, sign()]);
  }
  const field = o.field ?? 1;
  const fields = Array.from({ length: o.n }, () => (r() * 2 - 1) * field);
  return binaryModel(`spin-glass-${o.graph}-${o.n}`, o.n, edges, fields);
}
