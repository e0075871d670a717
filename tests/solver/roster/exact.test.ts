/**
 * Small rosters solved two independent ways: by brute force over every seat → person map
 * scored with scoreRoster (not through the model), and by the solver on the compiled model.
 * A wishes-only roster with one seat per person is checked against the Hungarian algorithm
 * (Kuhn–Munkres) from the npm package munkres-js.
 */
import { describe, expect, it } from 'vitest';
import computeMunkres from 'munkres-js';
import { rosterSchema, type Roster } from '../../../shared/roster/schema';
import { seededRandom } from '../../../shared/demo/make-roster';
import { compileRoster } from '../../../solver/roster/compile';
import { decodeAssignment } from '../../../solver/roster/decode';
import { scoreRoster } from '../../../solver/roster/score-roster';
import { solveMapSync, enumerateModel } from '../../../solver/inference';
import { bruteForceBest, smallWeekRoster } from './helpers';

function smallRoster(seed: number): Roster {
  return smallWeekRoster(
    seed,
    (rnd) => ({
      coverage: { weight: 5 + Math.floor(rnd() * 10), hard: rnd() < 0.3 },
      minRest: { hard: rnd() < 0.5, weight: 3 },
      maxConsecutiveDays: { days: 2, weight: 2 },
      maxHoursPer7Days: { hours: 24, hard: rnd() < 0.5, weight: 1 },
      contractedHours: { toleranceHours: 4, weight: 0.5 },
      skillMix: { requirements: [{ skill: 'first-aid', min: 1 }], weight: 2 },
    }),
    { end: '2027-01-07', earlyDays: ['mon', 'wed', 'thu'], nightDay: 'tue' },
  ).roster;
}

describe('small rosters: brute force over the roster equals the solver on the model', () => {
  it.each([1, 2, 3, 4])('roster seed %i (6 seats, 3 people: 4^6 fillings)', (seed) => {
    const r = smallRoster(seed);
    expect(r.seats.length).toBeLessThanOrEqual(8);
    const best = bruteForceBest(r);
    const c = compileRoster(r);
    const solved = solveMapSync(c.model, { seed: 1, timeLimitMs: 3_000, method: 'mplp' });
    const enumerated = enumerateModel(c.model);
    const same = (a: number, b: number) => (b === -Infinity ? expect(a).toBe(-Infinity) : expect(a).toBeCloseTo(b, 9));
    same(enumerated.score, best);
    same(solved.score, best);
    // the solver's roster, decoded and scored independently, scores what it claims
    same(scoreRoster(r, decodeAssignment(c, solved.assignment).assignment).total, solved.score);
  });
});

describe('wishes only, one seat per person: the Hungarian optimum (munkres-js)', () => {
  it.each([11, 12, 13])('seed %i: 9 people, 9 simultaneous one-seat posts', (seed) => {
    const n = 9;
    const rnd = seededRandom(seed);
    const people = Array.from({ length: n }, (_, i) => ({ id: `p${i}`, name: `Person ${i}`, skills: [] }));
    // simultaneous posts: any two overlap, so double booking allows one seat per person
    const shifts = Array.from({ length: n }, (_, j) => ({ id: `post${j}`, patternLabel: `post ${j}`, start: '2027-01-04T07:00', end: '2027-01-04T15:00' }));
    const value = people.map(() => shifts.map(() => Math.floor(rnd() * 10) - 3));
    const wishes = people.flatMap((p, i) =>
      shifts.flatMap((s, j) => (value[i][j] === 0 ? [] : [{ person: p.id, shift: s.id, kind: value[i][j] > 0 ? 'prefer' : 'avoid', strength: Math.abs(value[i][j]) }])),
    );
    const off = { enabled: false };
    const r = rosterSchema.parse({
      period: { start: '2027-01-04', end: '2027-01-04', timeZone: 'Europe/London' },
      skills: [],
      people,
      shifts,
      seats: shifts.map((s) => ({ id: `${s.id}-seat`, shift: s.id })),
      wishes,
      rules: {
        coverage: { hard: true },
        minRest: off, weeklyRest: off, maxHoursPer7Days: off, nightShiftLength: off, maxConsecutiveDays: off,
        maxNightsInRow: off, contractedHours: off, fairNights: off, fairWeekends: off, skillMix: off,
      },
    });
    // Hungarian minimises cost: cost = max - value
    const pairs = computeMunkres(value.map((row) => row.map((v) => 10 - v)));
    const hungarian = pairs.reduce((m, [i, j]) => m + value[i][j], 0);
    const c = compileRoster(r);
    expect(c.model.factors.some((f) => f.kind === 'pairwise' || f.kind === 'table')).toBe(false);
    const solved = solveMapSync(c.model, { seed: 1, timeLimitMs: 10_000 });
    expect(solved.feasible).toBe(true);
    expect(solved.score).toBeCloseTo(hungarian, 9);
    expect(scoreRoster(r, decodeAssignment(c, solved.assignment).assignment).total).toBeCloseTo(hungarian, 9);
  });
});
