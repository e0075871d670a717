// Structured factor messages against brute force: for each operator the factor-to-
// variable message max_{x_c\x_s} [θ_c + Σ_{t≠s} inc_t] (and its log-sum-exp form) is
// recomputed here by enumerating the factor's scope with the model's factorScore().
import { describe, expect, it } from 'vitest';
import { factorScore, scopeOf, type Factor, type Model } from '../../../solver/model';
import { buildEngine } from '../../../solver/inference';
import { prng } from '../helpers/models';

function lse(v: number[]): number {
  const m = Math.max(...v);
  if (m === -Infinity) return m;
  return m + Math.log(v.reduce((a, x) => a + Math.exp(x - m), 0));
}

/** Compare every slot's message of the single operator(s) compiled from `f` with brute force. */
function checkFactor(variables: Model['variables'], f: Factor, seed: number) {
  const model: Model = { variables, factors: [f] };
  const engine = buildEngine(model);
  const r = prng(seed);
  const scope = scopeOf(f);
  const full = variables.map((v) => Array.from({ length: v.cardinality }, () => r() * 4 - 2));
  for (const sr of ['max', 'sum'] as const) {
    for (const op of engine.ops) {
      const n = op.vars.length, len = op.off[n]!;
      const inc = new Float64Array(len), out = new Float64Array(len), incRest = new Float64Array(n), outRest = new Float64Array(n);
      for (let s = 0; s < n; s++) {
        const v = full[op.vars[s]!]!;
        if (!op.sup) for (let x = 0; x < v.length; x++) inc[op.off[s]! + x] = v[x]!;
        else {
          const sup = Array.from(op.sup.subarray(op.off[s]!, op.off[s + 1]!));
          sup.forEach((x, k) => (inc[op.off[s]! + k] = v[x]!));
          const rest = v.filter((_, x) => !sup.includes(x));
          incRest[s] = rest.length ? (sr === 'max' ? Math.max(...rest) : lse(rest)) : -Infinity;
        }
      }
      op.message(sr, inc, incRest, out, outRest);
      // brute force over the operator's own scope (one op may cover a subset of the factor for n-ary allDifferent)
      const opVars = Array.from(op.vars);
      const card = opVars.map((v) => variables[v]!.cardinality);
      for (let s = 0; s < n; s++) {
        for (let xs = 0; xs < card[s]!; xs++) {
          const vals: number[] = [];
          const x = new Array<number>(variables.length).fill(0);
          const idx = new Array<number>(n).fill(0);
          const total = card.reduce((a, b) => a * b, 1);
          for (let e = 0; e < total; e++) {
            if (idx[s] === xs) {
              opVars.forEach((v, j) => (x[v] = idx[j]!));
              let sc = opScore(model, f, op, x);
              for (let t = 0; t < n; t++) if (t !== s) sc += full[opVars[t]!]![idx[t]!]!;
              vals.push(sc);
            }
            for (let j = n - 1; j >= 0; j--) {
              if (++idx[j]! < card[j]!) break;
              idx[j] = 0;
            }
          }
          const want = sr === 'max' ? Math.max(...vals) : lse(vals);
          let got: number;
          if (!op.sup) got = out[op.off[s]! + xs]!;
          else {
            const k = Array.from(op.sup.subarray(op.off[s]!, op.off[s + 1]!)).indexOf(xs);
            got = k >= 0 ? out[op.off[s]! + k]! : outRest[s]!;
          }
          if (want === -Infinity) expect(got).toBeLessThan(-engine.H / 2);
          else expect(got).toBeCloseTo(want, 8);
        }
      }
    }
  }
  void scope;
}

/** Score of one compiled operator: the whole factor, or one key's share of an n-ary allDifferent. */
function opScore(model: Model, f: Factor, op: { vars: Int32Array; sup: Int32Array | null; off: Int32Array }, x: number[]): number {
  if (f.kind === 'allDifferent' && f.vars.length > 2) {
    let holders = 0;
    for (let s = 0; s < op.vars.length; s++) if (Array.from(op.sup!.subarray(op.off[s]!, op.off[s + 1]!)).includes(x[op.vars[s]!]!)) holders++;
    const p = f.penalty ?? -Infinity;
    return p === -Infinity ? (holders <= 1 ? 0 : -Infinity) : (p * holders * (holders - 1)) / 2;
  }
  return factorScore(model, f, x);
}

const keyed = (n: number, k: number, shift = 1) =>
  Array.from({ length: n }, (_, i) => ({ name: `v${i}`, cardinality: k, keys: Array.from({ length: k }, (_, x) => (x === k - 1 ? -1 : (x * shift + i) % (k + 1))) }));

describe('structured factor messages (against brute-force enumeration of the factor)', () => {
  it('Potts over keys (sameKey), soft and hard, O(K)', () => {
    for (const w of [1.3, -0.7, -Infinity]) checkFactor(keyed(2, 5), { kind: 'sameKey', a: 0, b: 1, weight: w }, 11);
  });
  it('pairwise all-different', () => {
    checkFactor(keyed(2, 4), { kind: 'allDifferent', vars: [1, 0] }, 12);
  });
  it('sparse pairing table with a default, including listed pairs that shadow a larger default', () => {
    checkFactor(keyed(2, 5), { kind: 'sparsePair', a: 0, b: 1, entries: [[1, 2, 3], [2, 1, -2], [1, 1, -5], [3, 2, 0.5], [-1, 3, 1]], default: 0.25 }, 13);
    checkFactor(keyed(2, 4), { kind: 'sparsePair', a: 1, b: 0, entries: [[0, 1, -Infinity], [1, 1, -1]], default: 2 }, 14);
  });
  it('counting factor by dynamic programming (weights, caps, penalties)', () => {
    const f: Factor = { kind: 'counting', vars: [0, 1, 2, 3], weights: [[[0, 2]], [[1, 1], [2, 3]], [], [[0, 1], [1, 1]]], score: (s: number) => (s > 5 ? -Infinity : -Math.abs(s - 2)) };
    checkFactor(keyed(4, 3), f, 15);
    checkFactor(keyed(3, 3), { kind: 'counting', vars: [0, 1, 2], weights: [[[0, 1], [1, 1], [2, 1]], [[0, 2]], [[2, 1]]], score: [1, 0, 3, -1] }, 16);
  });
  it('n-ary all-different as one at-most-one operator per key, hard and soft', () => {
    checkFactor(keyed(4, 4, 1), { kind: 'allDifferent', vars: [0, 1, 2, 3] }, 17);
    checkFactor(keyed(4, 3, 1), { kind: 'allDifferent', vars: [0, 1, 2, 3], penalty: -1.5 }, 18);
  });
  it('dense n-ary table', () => {
    const vars = keyed(3, 3);
    const r = prng(19);
    checkFactor(vars, { kind: 'table', vars: [2, 0, 1], table: Array.from({ length: 27 }, () => (r() < 0.2 ? -Infinity : r())) }, 20);
  });
});

describe('memory: structured factors are not expanded', () => {
  it('a 2,000 × 201 seat model compiles without any K×K table', async () => {
    const { rosterModel } = await import('../../../solver/bench/families');
    const m = rosterModel({ people: 200, days: 28, shiftsPerDay: 3, seatsPerShift: 24, dayAllDifferent: true, weeklyCap: 5, pairings: true, seed: 3 });
    expect(m.variables.length).toBeGreaterThanOrEqual(2000);
    expect(Math.max(...m.variables.map((v) => v.cardinality))).toBe(201);
    const engine = buildEngine(m);
    expect(engine.ops.some((op) => op.kind === 'pairwise' || op.kind === 'table')).toBe(false);
    // total message storage stays within a few K-vectors per variable and factor scope
    const entries = engine.ops.reduce((a, op) => a + op.off[op.vars.length]!, 0);
    const pairwiseScopes = engine.ops.filter((op) => !op.sup).length;
    expect(entries).toBeLessThan(2 * 201 * pairwiseScopes + 10 * engine.ops.reduce((a, op) => a + (op.sup ? op.vars.length : 0), 0));
  }, 60_000);
});
