import { describe, expect, it } from 'vitest';
import { makeRoster } from '../../../shared/demo/make-roster';
import { makeWillowmereRoster } from '../../../shared/demo/willowmere';
import { rosterSchema } from '../../../shared/roster/schema';
import { solveRoster } from '../../../solver/roster/solve-roster';
import { scoreRoster } from '../../../solver/roster/score-roster';
import { greedyRoster } from './helpers';

describe('solveRoster', () => {
  it('returns the reasons instead of a roster when a pre-check proves it infeasible', async () => {
    const r = makeWillowmereRoster({ rules: { coverage: { hard: true } } });
    const bad = rosterSchema.parse({ ...r, pins: [{ seat: 'early-2027-01-04-1', person: 'priya' }, { seat: 'late-2027-01-04-1', person: 'priya' }] });
    const out = await solveRoster(bad, { timeLimitMs: 500 });
    expect(out).toEqual({ status: 'infeasible', reasons: ['Priya Hollinshead is pinned to the early shift on Mon 4 Jan and the late shift on Mon 4 Jan, with 0 h rest; minimum 11 h (hard)'] });
  });

  it('solves, decodes and scores independently; a start roster is never made worse', async () => {
    const r = makeRoster({ people: 8, weeks: 2, seed: 6 });
    const start = greedyRoster(r);
    const out = await solveRoster(r, { timeLimitMs: 800, start, localSearch: true });
    if (out.status !== 'solved') throw new Error('expected a roster');
    expect(out.score.feasible).toBe(true);
    expect(out.score.total).toBeCloseTo(out.result.score, 9);
    expect(out.score.total).toBeGreaterThanOrEqual(scoreRoster(r, start).total - 1e-9);
    expect(out.decoded.openSeats.length).toBe(0);
  });
});
