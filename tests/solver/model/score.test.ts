// Model scoring against definitions written out here (pair loops, sums of weights).
import { describe, expect, it } from 'vitest';
import { factorContributions, ModelError, score, validateModel, type Model } from '../../../solver/model';
import { makeRandomModel, prng } from '../helpers/models';

describe('score', () => {
  it('is the sum of the factor contributions plus the constant', () => {
    const m = { ...makeRandomModel({ seed: 3, n: 8, k: 3 }), constant: 2.5 };
    const r = prng(1);
    for (let t = 0; t < 50; t++) {
      const x = m.variables.map((v) => Math.floor(r() * v.cardinality));
      const parts = factorContributions(m, x);
      const sum = parts.reduce((a, p) => a + p.score, 2.5);
      const s = score(m, x);
      if (s === -Infinity) expect(parts.some((p) => p.score === -Infinity)).toBe(true);
      else expect(s).toBeCloseTo(sum, 12);
    }
  });

  it('structured factors follow their definitions over keys', () => {
    const keys = [
      [3, 1, -1],
      [1, 3, -1],
      [3, 2, -1],
      [-1, 2, 1],
    ];
    const m: Model = {
      variables: keys.map((k, i) => ({ name: `s${i}`, cardinality: 3, keys: k })),
      factors: [
        { kind: 'allDifferent', vars: [0, 1, 2, 3], penalty: -2 },
        { kind: 'sameKey', a: 0, b: 2, weight: 1.5 },
        { kind: 'sparsePair', a: 1, b: 3, entries: [[1, 2, 4], [3, 1, -1]], default: 0.5 },
        { kind: 'counting', vars: [0, 1, 2], weights: [[[0, 8]], [[1, 8]], [[0, 12]]], score: (s: number) => -Math.max(0, s - 12) },
      ],
    };
    const r = prng(2);
    for (let t = 0; t < 60; t++) {
      const x = m.variables.map(() => Math.floor(r() * 3));
      const k = x.map((v, i) => keys[i]![v]!);
      let pairs = 0;
      for (let a = 0; a < 4; a++) for (let b = a + 1; b < 4; b++) if (k[a]! >= 0 && k[a] === k[b]) pairs++;
      const same = k[0]! >= 0 && k[0] === k[2] ? 1.5 : 0;
      const sparse = k[1] === 1 && k[3] === 2 ? 4 : k[1] === 3 && k[3] === 1 ? -1 : 0.5;
      const hours = (x[0] === 0 ? 8 : 0) + (x[1] === 1 ? 8 : 0) + (x[2] === 0 ? 12 : 0);
      expect(score(m, x)).toBeCloseTo(-2 * pairs + same + sparse - Math.max(0, hours - 12), 12);
    }
  });

  it('rejects malformed models with a message naming the part', () => {
    expect(() => validateModel({ variables: [{ name: 'a', cardinality: 2 }], factors: [{ kind: 'unary', v: 0, table: [1] }] })).toThrow(ModelError);
    expect(() => validateModel({ variables: [{ name: 'a', cardinality: 2 }], factors: [{ kind: 'pairwise', a: 0, b: 3, table: [] }] })).toThrow(/out of range/);
    expect(() => validateModel({ variables: [{ name: 'a', cardinality: 2 }], factors: [{ kind: 'counting', vars: [0], weights: [[[1, 1.5]]], score: [0] }] })).toThrow(/integers/);
  });
});
