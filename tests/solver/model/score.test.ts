// Model scoring against numbers worked out by hand and counts with closed forms over full
// enumeration; nothing here calls factorScore or factorContributions to get the expected value.
import { describe, expect, it } from 'vitest';
import { ModelError, score, validateModel, type Factor, type Model, type Variable } from '../../../solver/model';

/** Every assignment of the given cardinalities, first variable slowest. */
function* assignments(cards: number[]): Generator<number[]> {
  const x = cards.map(() => 0);
  for (;;) {
    yield [...x];
    let i = cards.length - 1;
    while (i >= 0 && ++x[i]! === cards[i]) x[i--] = 0;
    if (i < 0) return;
  }
}

const vars = (cards: number[], keys?: number[][]): Variable[] => cards.map((cardinality, i) => ({ name: `v${i}`, cardinality, ...(keys ? { keys: keys[i] } : {}) }));
const one = (variables: Variable[], factor: Factor, constant?: number): Model => ({ variables, factors: [factor], ...(constant === undefined ? {} : { constant }) });
const binomial = (n: number, k: number): number => (k < 0 || k > n ? 0 : k === 0 ? 1 : (binomial(n - 1, k - 1) * n) / k);

describe('score: each factor kind at hand-computed points', () => {
  it('unary reads table[x]; the constant is added once', () => {
    const m = one(vars([3]), { kind: 'unary', v: 0, table: [0.5, -1.25, 2] }, 10);
    // hand: 10 + table[x]
    expect([0, 1, 2].map((x) => score(m, [x]))).toEqual([10.5, 8.75, 12]);
  });

  it('pairwise is row-major: table[xa * K_b + xb]', () => {
    // K_a = 2, K_b = 3; entry (1, 2) is index 1·3 + 2 = 5
    const m = one(vars([2, 3]), { kind: 'pairwise', a: 0, b: 1, table: [0, 1, 2, 3, 4, 5] });
    expect(score(m, [1, 2])).toBe(5);
    expect(score(m, [0, 2])).toBe(2);
    expect(score(m, [1, 0])).toBe(3);
    // a = 1, b = 0 (the factor's first variable is b): index x1·K_0 + x0
    const flipped = one(vars([2, 3]), { kind: 'pairwise', a: 1, b: 0, table: [0, 1, 2, 3, 4, 5] });
    expect(score(flipped, [1, 2])).toBe(2 * 2 + 1);
  });

  it('table factors vary their last variable fastest (UAI order)', () => {
    // scope [2, 0, 1] with cardinalities 2, 2, 3 → index ((x2·2) + x0)·3 + x1
    const table = Array.from({ length: 12 }, (_, i) => i * 10);
    const m = one(vars([2, 3, 2]), { kind: 'table', vars: [2, 0, 1], table });
    expect(score(m, [1, 2, 1])).toBe((((1 * 2) + 1) * 3 + 2) * 10); // 110
    expect(score(m, [0, 1, 0])).toBe(10);
  });

  it('sameKey adds its weight only when both keys agree and are not -1', () => {
    const keys = [[4, -1, 7], [7, -1, 4]];
    const m = one(vars([3, 3], keys), { kind: 'sameKey', a: 0, b: 1, weight: -3.5 });
    expect(score(m, [0, 2])).toBe(-3.5); // key 4 and key 4
    expect(score(m, [2, 0])).toBe(-3.5); // key 7 and key 7
    expect(score(m, [0, 0])).toBe(0); // 4 vs 7
    expect(score(m, [1, 1])).toBe(0); // -1 and -1: "no identity" never collides
  });

  it('sparsePair reads the entry for the pair of keys, else the default', () => {
    const keys = [[0, 1, -1], [1, 0, -1]];
    const m = one(vars([3, 3], keys), { kind: 'sparsePair', a: 0, b: 1, entries: [[0, 1, 4], [1, 1, -2], [-1, 0, 0.25]], default: -0.5 });
    expect(score(m, [0, 0])).toBe(4); // keys (0, 1)
    expect(score(m, [1, 0])).toBe(-2); // keys (1, 1)
    expect(score(m, [2, 1])).toBe(0.25); // keys (-1, 0)
    expect(score(m, [0, 1])).toBe(-0.5); // keys (0, 0): not listed
    expect(score(m, [2, 2])).toBe(-0.5); // keys (-1, -1): not listed
  });

  it('allDifferent charges its penalty once per colliding pair', () => {
    const m = one(vars([3, 3, 3, 3]), { kind: 'allDifferent', vars: [0, 1, 2, 3], penalty: -2 });
    expect(score(m, [0, 1, 2, 0])).toBe(-2); // one pair holds key 0
    expect(score(m, [1, 1, 1, 0])).toBe(-6); // three holders: C(3,2) = 3 pairs
    expect(score(m, [2, 2, 2, 2])).toBe(-12); // C(4,2) = 6 pairs
    expect(score(m, [0, 1, 2, 1])).toBe(-2);
    const hard = one(vars([3, 3]), { kind: 'allDifferent', vars: [0, 1] });
    expect(score(hard, [1, 1])).toBe(-Infinity);
    expect(score(hard, [1, 2])).toBe(0);
  });

  it('counting sums the listed weights and reads the score table, repeating its last entry', () => {
    // hours: v0 = 0 → 8, v1 = 1 → 8 and v1 = 2 → 12, v2 = 0 → 12
    const f: Factor = { kind: 'counting', vars: [0, 1, 2], weights: [[[0, 8]], [[1, 8], [2, 12]], [[0, 12]]], score: Array.from({ length: 21 }, (_, s) => -s / 4) };
    const m = one(vars([2, 3, 2]), f);
    expect(score(m, [0, 1, 1])).toBe(-4); // 8 + 8 = 16 → -16/4
    expect(score(m, [1, 0, 1])).toBe(0); // nothing counted
    expect(score(m, [0, 2, 0])).toBe(-5); // 8 + 12 + 12 = 32, past the table's end (20) → its last entry -20/4
    const byFunction = one(vars([2, 3, 2]), { ...f, score: (s: number) => -Math.max(0, s - 20) });
    expect(score(byFunction, [0, 2, 0])).toBe(-12); // 32 h against a 20 h limit
    expect(score(byFunction, [0, 1, 1])).toBe(0);
  });

  it('sums factors and stops at -Infinity whatever comes after', () => {
    const m: Model = {
      variables: vars([2, 2]),
      constant: 1,
      factors: [
        { kind: 'unary', v: 0, table: [0, 2] },
        { kind: 'pairwise', a: 0, b: 1, table: [0, 0, -Infinity, 0.5] },
        { kind: 'unary', v: 1, table: [Infinity, 3] },
      ],
    };
    expect(score(m, [1, 1])).toBe(1 + 2 + 0.5 + 3);
    // (1, 0) is forbidden by the pairwise table; the +Infinity after it must not turn it into NaN
    expect(score(m, [1, 0])).toBe(-Infinity);
  });
});

describe('score: sums over every assignment against closed forms', () => {
  it('unary factors only: Σ_x exp(score) = Π_i Σ_v exp(table_i[v]) and the best score is the sum of maxima (distributivity)', () => {
    const tables = [[0.3, -1, 0.8], [1.1, -0.4], [0, 0.5, -2, 0.25]];
    const m: Model = { variables: vars(tables.map((t) => t.length)), factors: tables.map((table, v) => ({ kind: 'unary', v, table })) };
    let z = 0;
    let best = -Infinity;
    for (const x of assignments(tables.map((t) => t.length))) {
      const s = score(m, x);
      z += Math.exp(s);
      best = Math.max(best, s);
    }
    const product = tables.reduce((p, t) => p * t.reduce((a, v) => a + Math.exp(v), 0), 1);
    expect(z).toBeCloseTo(product, 10);
    expect(best).toBeCloseTo(0.8 + 1.1 + 0.5, 12);
  });

  it('hard allDifferent over n variables of k shared keys: k!/(k−n)! feasible assignments (injective maps)', () => {
    for (const [n, k] of [[3, 4], [4, 4], [2, 5], [4, 3]] as const) {
      const m = one(vars(Array(n).fill(k)), { kind: 'allDifferent', vars: Array.from({ length: n }, (_, i) => i) });
      let feasible = 0;
      for (const x of assignments(Array(n).fill(k))) if (score(m, x) === 0) feasible++;
      const falling = Array.from({ length: n }, (_, i) => k - i).reduce((a, b) => a * Math.max(b, 0), 1);
      expect(feasible, `n=${n} k=${k}`).toBe(falling);
    }
  });

  it('soft allDifferent: the penalties over all kⁿ assignments add up to penalty · C(n,2) · kⁿ⁻¹ (each pair collides in kⁿ⁻¹ of them)', () => {
    const [n, k, penalty] = [4, 3, -0.75];
    const m = one(vars(Array(n).fill(k)), { kind: 'allDifferent', vars: [0, 1, 2, 3], penalty });
    let total = 0;
    for (const x of assignments(Array(n).fill(k))) total += score(m, x);
    expect(total).toBeCloseTo(penalty * binomial(n, 2) * k ** (n - 1), 10); // -0.75 · 6 · 27 = -121.5
  });

  it('counting with weight 1 on value 1 of n binary variables: score table[s] is met by C(n,s) assignments', () => {
    const n = 6;
    const table = [0, -1, -3, -6]; // s ≥ 3 reads -6
    const m = one(vars(Array(n).fill(2)), { kind: 'counting', vars: Array.from({ length: n }, (_, i) => i), weights: Array.from({ length: n }, () => [[1, 1]] as Array<[number, number]>), score: table });
    const seen = new Map<number, number>();
    for (const x of assignments(Array(n).fill(2))) seen.set(score(m, x), (seen.get(score(m, x)) ?? 0) + 1);
    expect(seen.get(0)).toBe(binomial(n, 0));
    expect(seen.get(-1)).toBe(binomial(n, 1));
    expect(seen.get(-3)).toBe(binomial(n, 2));
    expect(seen.get(-6)).toBe(2 ** n - 1 - n - binomial(n, 2)); // every s ≥ 3: 64 − 1 − 6 − 15 = 42
  });

  it('sameKey over identity keys: a pair of variables with k values agrees on exactly k of k² assignments', () => {
    const k = 5;
    const m = one(vars([k, k]), { kind: 'sameKey', a: 0, b: 1, weight: 2 });
    let total = 0;
    for (const x of assignments([k, k])) total += score(m, x);
    expect(total).toBe(2 * k);
  });
});

describe('validateModel', () => {
  it('rejects malformed models with a message naming the part', () => {
    expect(() => validateModel({ variables: [{ name: 'a', cardinality: 2 }], factors: [{ kind: 'unary', v: 0, table: [1] }] })).toThrow(ModelError);
    expect(() => validateModel({ variables: [{ name: 'a', cardinality: 2 }], factors: [{ kind: 'pairwise', a: 0, b: 3, table: [] }] })).toThrow(/out of range/);
    expect(() => validateModel({ variables: [{ name: 'a', cardinality: 2 }], factors: [{ kind: 'counting', vars: [0], weights: [[[1, 1.5]]], score: [0] }] })).toThrow(/integers/);
  });
});
