import { describe, expect, it } from 'vitest';
import { makeRoster } from '../../../shared/demo/make-roster';
import { makeWillowmereRoster } from '../../../shared/demo/willowmere';
import { rosterSchema } from '../../../shared/roster/schema';
import { solveRoster, withPins } from '../../../solver/roster/solve-roster';
import { scoreRoster } from '../../../solver/roster/score-roster';
import { greedyRoster } from './helpers';
import { compileRoster } from '../../../solver/roster/compile';
import { greedyAssignment } from '../../../solver/roster/greedy';
import { score as modelScore } from '../../../solver/model';
import { highsOptimum } from '../../../solver/bench/highs-mip';

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

describe('solveRoster on a model too large for the engine (greedy start, then LNS and the bound)', () => {
  // engineMaxFactors: 0 sends a small roster down the path 60 × 13 weeks and 200 × 4 weeks take,
  // so its figures can be checked against HiGHS's optimum of the same model (HiGHS MIP, npm highs)
  it('keeps every hard rule, never loses the greedy start, and its bound is at least HiGHS\'s optimum', async () => {
    const r = makeRoster({ people: 6, weeks: 1, seed: 4 });
    const out = await solveRoster(r, { timeLimitMs: 2_000, seed: 1, engineMaxFactors: 0 });
    if (out.status !== 'solved') throw new Error('expected a roster');
    expect(out.result.method.startsWith('greedy')).toBe(true);
    expect(out.score.feasible).toBe(true);
    expect(out.score.total).toBeCloseTo(out.result.score, 9);
    const c = compileRoster(r);
    expect(out.result.score).toBeGreaterThanOrEqual(modelScore(c.model, greedyAssignment(c)) - 1e-9);
    const h = await highsOptimum(out.compiled.model, { timeLimitS: 60 });
    expect(h.status).toBe('optimal');
    expect(out.result.score).toBeLessThanOrEqual(h.score + 1e-6);
    expect(out.result.bound).toBeGreaterThanOrEqual(h.score - 1e-6);
    if (out.result.optimal) expect(out.result.score).toBeCloseTo(h.score, 6);
  }, 120_000);
});

describe('withPins: the start of a re-solve', () => {
  const roster = makeWillowmereRoster();
  // Day 1 early, day 1 late, day 2 early, day 4 early: seats taken from the demo's own shifts.
  const seatOn = (date: string, label: RegExp) => {
    const shift = roster.shifts.find((s) => s.start.startsWith(date) && label.test(s.patternLabel ?? s.id))!;
    return roster.seats.filter((s) => s.shift === shift.id).map((s) => s.id);
  };
  const [e1a, e1b] = seatOn(roster.shifts[0].start.slice(0, 10), /early/i);
  const [l1] = seatOn(roster.shifts[0].start.slice(0, 10), /late/i);
  const day = (n: number) => new Date(Date.parse(`${roster.shifts[0].start.slice(0, 10)}T00:00Z`) + n * 86_400_000).toISOString().slice(0, 10);
  const [e2] = seatOn(day(1), /early/i);
  const [e4] = seatOn(day(3), /early/i);
  const [a, b] = roster.people.map((p) => p.id);

  it('puts the pinned person in, takes them off seats within a day of it, keeps the rest', () => {
    const start = Object.fromEntries(roster.seats.map((s) => [s.id, null as string | null]));
    Object.assign(start, { [e1a]: b, [l1]: a, [e2]: a, [e4]: a });
    const out = withPins({ ...roster, pins: [{ seat: e1a, person: a }] }, start);
    expect(out[e1a]).toBe(a); // the pin
    expect(out[l1]).toBeNull(); // same day: she cannot keep both
    expect(out[e2]).toBe(a); // next day's early starts 24 h later (16 h of rest): kept
    expect(out[e4]).toBe(a); // three days later: untouched
    expect(out[e1b]).toBeNull();
  });
});
