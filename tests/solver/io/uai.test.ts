// UAI MARKOV / MPE interchange: round trips are checked by scoring random assignments
// with the model's own definition before and after; parse errors must name the line.
import { describe, expect, it } from 'vitest';
import { score } from '../../../solver/model';
import { enumerateModel } from '../../../solver/inference';
import { parseMpe, parseUai, UaiError, writeMpe, writeUaiWithOffset } from '../../../solver/io';
import { allAssignments, makeRandomModel } from '../helpers/models';

const SMALL = `MARKOV
3
2 2 3
3
1 0
2 0 1
2 1 2

2
 0.436 0.564

4
 0.128 0.872
 0.920 0.080

6
 0.210 0.333 0.457
 0.811 0.000 0.189
`;

describe('UAI MARKOV files', () => {
  it('parses a hand-written file: the score of every assignment is the log of the product of its table entries', () => {
    const { model } = parseUai(SMALL);
    const t0 = [0.436, 0.564], t1 = [0.128, 0.872, 0.92, 0.08], t2 = [0.21, 0.333, 0.457, 0.811, 0, 0.189];
    for (const [a, b, c] of allAssignments(model) as Iterable<[number, number, number]>) {
      const p = t0[a]! * t1[a * 2 + b]! * t2[b * 3 + c]!; // last scope variable varies fastest
      if (p === 0) expect(score(model, [a, b, c])).toBe(-Infinity);
      else expect(score(model, [a, b, c])).toBeCloseTo(Math.log(p), 12);
    }
  });

  it('write then read keeps every assignment’s score (up to the reported offset), structured factors included', () => {
    for (let seed = 1; seed <= 5; seed++) {
      const m = makeRandomModel({ seed, n: 7, k: 3, edges: 10, kinds: ['pairwise', 'sameKey', 'sparsePair', 'allDifferent2', 'softAllDifferent'] });
      const { text, offset } = writeUaiWithOffset(m);
      const back = parseUai(text).model;
      let checked = 0;
      for (const x of allAssignments(m)) {
        const a = score(m, x), b = score(back, x);
        if (a === -Infinity) expect(b).toBe(-Infinity);
        else expect(b + offset).toBeCloseTo(a, 9);
        if (++checked > 400) break;
      }
      expect(enumerateModel(back).score + offset).toBeCloseTo(enumerateModel(m).score, 9);
    }
  });

  const bad: Array<[string, string, number]> = [
    ['BAYES\n1\n2\n1\n1 0\n2\n0.5 0.5\n', 'BAYES', 1],
    ['MARKOV\n2\n2 x\n', 'cardinality of variable 1', 3],
    ['MARKOV\n2\n2 2\n1\n2 0 5\n', 'variable 5', 5],
    ['MARKOV\n1\n2\n1\n1 0\n\n3\n0.1 0.2 0.3\n', 'needs 2', 7],
    ['MARKOV\n1\n2\n1\n1 0\n\n2\n0.1\n', 'end of file', 8],
    ['MARKOV\n1\n2\n1\n1 0\n\n2\n0.1 -3\n', 'negative', 8],
    ['MARKOV\n1\n2\n1\n1 0\n\n2\n0.1 0.9\n7\n', 'extra content', 9],
  ];
  it.each(bad)('rejects malformed input with the line at fault (%#)', (text, words, line) => {
    let err: unknown;
    try {
      parseUai(text);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(UaiError);
    expect((err as UaiError).line).toBe(line);
    expect((err as Error).message).toContain(words);
    expect((err as Error).message.split('\n')).toHaveLength(1);
  });
});

describe('UAI MPE results', () => {
  it('writes "MPE" then "N v1 … vN" and reads both the current and the older layout', () => {
    const text = writeMpe([0, 2, 1]);
    expect(text.split('\n').slice(0, 2)).toEqual(['MPE', '3 0 2 1']);
    expect(parseMpe(text, 3)).toEqual([0, 2, 1]);
    expect(parseMpe('MPE\n1\n3 0 2 1\n')).toEqual([0, 2, 1]);
    expect(() => parseMpe('MPE\n2 0 1\n', 3)).toThrow(/line 2/);
  });
});
