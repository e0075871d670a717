// Regression: local search could not see breaches of an n-ary all-different or a hard
// counting cap, because every sum past the limit scored the same -H (a plateau): moving
// one of three colliding seats away changed nothing, so the roster stayed infeasible.
// Fixed by grading the penalty (each unit past the limit costs another H) in local search.
import { describe, expect, it } from 'vitest';
import { violatedFactors, type Factor, type Model } from '../../../solver/model';
import { buildEngine, enumerateModel } from '../../../solver/inference';
import { LocalSearch, rng } from '../../../solver/inference/local-search';

describe('regression: flat hard penalties hid breaches from local search', () => {
  it('three seats that all want person 0 under one n-ary all-different are repaired', () => {
    const seat = (i: number) => ({ name: `seat${i}`, cardinality: 3, keys: [0, 1, -1] });
    const m: Model = {
      variables: [seat(0), seat(1), seat(2), seat(3)],
      factors: [
        ...[0, 1, 2, 3].map((i): Factor => ({ kind: 'unary', v: i, table: [5, 1, 0] })),
        { kind: 'allDifferent', vars: [0, 1, 2, 3] },
      ],
    };
    const engine = buildEngine(m);
    const ls = new LocalSearch(engine, [0, 0, 0, 0], rng(1));
    ls.run(Date.now() + 1_000);
    expect(violatedFactors(m, ls.x)).toEqual([]);
    // and it reaches the optimum here (one seat each for persons 0 and 1, the rest open)
    expect(Array.from(ls.x).sort()).toEqual([...enumerateModel(m).assignment].sort());
  });

  it('a person over a hard weekly cap is moved off enough seats', () => {
    const m: Model = {
      variables: Array.from({ length: 5 }, (_, i) => ({ name: `shift${i}`, cardinality: 2, keys: [0, -1] })),
      factors: [
        ...[0, 1, 2, 3, 4].map((i): Factor => ({ kind: 'unary', v: i, table: [2 + i * 0.1, 0] })),
        { kind: 'counting', vars: [0, 1, 2, 3, 4], weights: [0, 1, 2, 3, 4].map(() => [[0, 1]] as Array<[number, number]>), score: (s: number) => (s > 2 ? -Infinity : 0) },
      ],
    };
    const ls = new LocalSearch(buildEngine(m), [0, 0, 0, 0, 0], rng(2));
    ls.run(Date.now() + 1_000);
    expect(violatedFactors(m, ls.x)).toEqual([]);
    expect(Array.from(ls.x)).toEqual(enumerateModel(m).assignment);
  });
});
