/**
 * ±J spin glasses with fields (issue 14's UAI targets): the MAP score against HiGHS's proven
 * optimum (npm `highs` on the MIP of solver/bench/highs-mip.ts). The 100-spin torus is one
 * whose local-polytope bound (200 against an optimum of about 147) keeps branch and bound from
 * finishing, so it checks that tabu search still gets its turns after branch and bound starts.
 */
import { describe, expect, it } from 'vitest';
import { spinGlass } from '../../../solver/bench/families';
import { highsOptimum } from '../../../solver/bench/highs-mip';
import { solveMap } from '../../../solver/inference/solve';
import { score } from '../../../solver/model/score';

// CPU time of this process, so the budget means the same on a loaded machine
const cpuMs = (): number => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
};

describe('±J spin glasses against HiGHS', () => {
  it.each([
    ['torus 10×10, 100 spins', { n: 100, graph: 'torus' as const, w: 10, field: 1, seed: 81 }],
    ['random graph, 50 spins, degree 6', { n: 50, graph: 'random' as const, degree: 6, field: 1, seed: 72 }],
  ])('%s: the score equals HiGHS proven optimum within 3 s of CPU; the bound is not below it', async (_name, o) => {
    const model = spinGlass(o);
    const h = await highsOptimum(model, { timeLimitS: 120 });
    // HiGHS: a reference only when proven optimal
    expect(h.status).toBe('optimal');
    const r = await solveMap(model, { timeLimitMs: 3_000, seed: 1, clock: cpuMs });
    expect(score(model, r.assignment)).toBeCloseTo(h.score, 6);
    expect(r.bound).toBeGreaterThanOrEqual(h.score - 1e-6);
  }, 180_000);
});
