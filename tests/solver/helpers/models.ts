/** Seeded model builders for solver tests; every builder takes overrides. */
import type { Factor, Model } from '../../../solver/model';

/** mulberry32, independent of the solver's own generator. */
export function prng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export interface RandomModelOptions {
  seed: number;
  n: number;
  k: number;
  edges: number;
  /** Probability that a dense pairwise entry is forbidden. */
  hardDensity: number;
  /** Factor kinds to draw from for edges. */
  kinds: Array<'pairwise' | 'sameKey' | 'sparsePair' | 'allDifferent2' | 'softAllDifferent'>;
  /** Add a counting factor and an n-ary all-different when n allows. */
  counting: boolean;
  nary: boolean;
  /** Keys: value x of variable i has key (x + shift_i) mod (k+1), some values keyless. */
  shuffledKeys: boolean;
}

/** A random model mixing every factor kind; small enough to enumerate when n·log k is small. */
export function makeRandomModel(o: Partial<RandomModelOptions> = {}): Model {
  const opt: RandomModelOptions = { seed: 1, n: 7, k: 3, edges: 10, hardDensity: 0.1, kinds: ['pairwise', 'sameKey', 'sparsePair', 'allDifferent2'], counting: true, nary: true, shuffledKeys: true, ...o };
  const r = prng(opt.seed);
  const variables = Array.from({ length: opt.n }, (_, i) => {
    const keys = Array.from({ length: opt.k }, (_, x) => (opt.shuffledKeys ? ((x + i) % (opt.k + 1)) - (x === opt.k - 1 && i % 3 === 0 ? 99 : 0) : x));
    return { name: `v${i}`, cardinality: opt.k, keys: keys.map((k) => (k < 0 ? -1 : k)) };
  });
  const factors: Factor[] = [];
  for (let i = 0; i < opt.n; i++) factors.push({ kind: 'unary', v: i, table: Array.from({ length: opt.k }, () => Math.round((r() * 4 - 2) * 100) / 100), id: `u${i}` });
  for (let e = 0; e < opt.edges; e++) {
    const a = Math.floor(r() * opt.n);
    let b = Math.floor(r() * (opt.n - 1));
    if (b >= a) b++;
    const kind = opt.kinds[Math.floor(r() * opt.kinds.length)]!;
    if (kind === 'pairwise') factors.push({ kind, a, b, table: Array.from({ length: opt.k * opt.k }, () => (r() < opt.hardDensity ? -Infinity : r() * 2 - 1)), id: `p${e}` });
    else if (kind === 'sameKey') factors.push({ kind, a, b, weight: r() < 0.2 ? -Infinity : r() * 3 - 1.5, id: `s${e}` });
    else if (kind === 'sparsePair')
      factors.push({ kind, a, b, entries: [[0, 1, r() * 3 - 1], [1, 0, -r()], [2, 2, r() * 2], [-1, 1, r() - 0.5]], default: r() - 0.5, id: `sp${e}` });
    else if (kind === 'allDifferent2') factors.push({ kind: 'allDifferent', vars: [a, b], id: `ad${e}` });
    else factors.push({ kind: 'allDifferent', vars: [a, b], penalty: -r() * 2, id: `sad${e}` });
  }
  if (opt.counting && opt.n >= 4)
    factors.push({
      kind: 'counting',
      vars: [0, 1, 2, 3],
      weights: [[[0, 2]], [[0, 1], [1, 2]], [[1, 1]], [[2 % opt.k, 3]]],
      score: (s: number) => (s > 5 ? -Infinity : -Math.abs(s - 3) * 0.7),
      id: 'count',
    });
  if (opt.nary && opt.n >= 7) factors.push({ kind: 'allDifferent', vars: [4, 5, 6], id: 'nary' });
  return { variables, factors, name: `random-${opt.seed}` };
}

/** A random tree (each variable i > 0 joined to a random earlier one) with mixed pairwise kinds. */
export function makeRandomTree(o: { seed: number; n: number; k: number; counting?: boolean }): Model {
  const r = prng(o.seed);
  const m = makeRandomModel({ seed: o.seed, n: o.n, k: o.k, edges: 0, counting: false, nary: false });
  const kinds = ['pairwise', 'sameKey', 'sparsePair', 'allDifferent'] as const;
  for (let i = 1; i < o.n; i++) {
    const p = Math.floor(r() * i);
    const kind = kinds[Math.floor(r() * kinds.length)]!;
    if (kind === 'pairwise') m.factors.push({ kind, a: p, b: i, table: Array.from({ length: o.k * o.k }, () => (r() < 0.15 ? -Infinity : r() * 2 - 1)) });
    else if (kind === 'sameKey') m.factors.push({ kind, a: i, b: p, weight: r() * 3 - 1.5 });
    else if (kind === 'sparsePair') m.factors.push({ kind, a: p, b: i, entries: [[0, 1, 1.25], [1, 1, -2], [2, 0, r()]], default: r() - 0.5 });
    else m.factors.push({ kind: 'allDifferent', vars: [p, i] });
  }
  return m;
}

/** Brute-force assignments of a model (odometer, last variable fastest). */
export function* allAssignments(model: Model): Generator<number[]> {
  const n = model.variables.length;
  const x = new Array<number>(n).fill(0);
  for (;;) {
    yield x.slice();
    let i = n - 1;
    while (i >= 0 && ++x[i]! >= model.variables[i]!.cardinality) x[i--] = 0;
    if (i < 0) return;
  }
}
