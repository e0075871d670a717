/**
 * The key consistency check: the compiled model's score of an assignment equals the
 * independent scorer's total for the same roster, on random rosters (random rules hard or
 * soft with random weights and limits, wishes, pairings, pins, a DST week) and random
 * assignments; per term too when the roster is feasible.
 */
import { describe, expect, it } from 'vitest';
import { makeRoster, seededRandom } from '../../../shared/demo/make-roster';
import { RULE_NAMES, rosterSchema, type Roster } from '../../../shared/roster/schema';
import { compileRoster, modelTerms } from '../../../solver/roster/compile';
import { decodeAssignment, encodeAssignment } from '../../../solver/roster/decode';
import { scoreRoster, TERM_NAMES } from '../../../solver/roster/score-roster';
import { score, validateModel } from '../../../solver/model';
import { makeWillowmereRoster } from '../../../shared/demo/willowmere';
import { randomValues } from './helpers';

let feasibleSeen = 0;

function randomRoster(seed: number): Roster {
  const rnd = seededRandom(seed * 7919);
  const rules: Record<string, unknown> = {};
  for (const name of RULE_NAMES) {
    rules[name] = { enabled: rnd() < 0.85, hard: rnd() < 0.25, weight: Math.round(rnd() * 50) / 4 };
  }
  Object.assign(rules.minRest as object, { hours: [8, 11, 12, 16][Math.floor(rnd() * 4)] });
  Object.assign(rules.weeklyRest as object, { days: 7, maxShifts: 3 + Math.floor(rnd() * 4) });
  Object.assign(rules.maxHoursPer7Days as object, { hours: 20 + Math.floor(rnd() * 30) });
  Object.assign(rules.nightShiftLength as object, { hours: [7, 8, 9][Math.floor(rnd() * 3)] });
  Object.assign(rules.maxConsecutiveDays as object, { days: 2 + Math.floor(rnd() * 4) });
  Object.assign(rules.maxNightsInRow as object, { nights: 1 + Math.floor(rnd() * 3) });
  Object.assign(rules.contractedHours as object, { toleranceHours: Math.floor(rnd() * 10) });
  Object.assign(rules.skillMix as object, { requirements: [{ skill: 'first-aid', min: 1 + Math.floor(rnd() * 2) }, { skill: 'medication', min: 1, patternLabel: 'late' }] });
  // a week over the spring DST change every third roster: nights of 7 h
  const dst = seed % 3 === 0;
  const r = makeRoster({
    people: 3 + Math.floor(rnd() * 6),
    weeks: 1 + Math.floor(rnd() * 2),
    start: dst ? '2027-03-22' : '2027-01-04',
    seed,
    wishesPerPerson: 3,
    pairingCount: 3,
    rules: rules as never,
    patterns: [
      { label: 'early', weekdays: ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'], start: '07:00', end: '15:00', seats: [{ skill: 'medication', count: 1 }, { skill: null, count: 1 }] },
      { label: 'late', weekdays: ['mon', 'wed', 'fri', 'sat', 'sun'], start: '14:30', end: '22:00', seats: [{ skill: null, count: 2 }] },
      { label: 'night', weekdays: ['mon', 'tue', 'thu', 'sat'], start: '22:00', end: '07:00', seats: [{ skill: 'night-lead', count: 1 }] },
    ],
  });
  // add a hard pairing and a few pins (valid ones: the pinned person holds the seat's skill)
  const pins = r.seats
    .filter(() => rnd() < 0.05)
    .map((seat) => {
      const ok = r.people.filter((p) => seat.skill === null || p.skills.includes(seat.skill));
      return { seat: seat.id, person: rnd() < 0.2 ? null : ok[Math.floor(rnd() * ok.length)].id };
    });
  const pairings = [...r.pairings];
  if (r.people.length >= 3 && !pairings.some((p) => [p.a, p.b].includes(r.people[0].id) && [p.a, p.b].includes(r.people[2].id)))
    pairings.push({ a: r.people[0].id, b: r.people[2].id, score: 0, never: true });
  return rosterSchema.parse({ ...r, pins, pairings });
}

/** The same roster with every rule soft and never-together turned into a negative score: nearly every careful assignment is feasible. */
function allSoft(r: Roster): Roster {
  const rules = Object.fromEntries(Object.entries(r.rules).map(([k, v]) => [k, { ...v, hard: false }]));
  const pairings = r.pairings.map((p) => (p.never ? { ...p, never: false, score: -5 } : p));
  return rosterSchema.parse({ ...r, rules, pairings });
}

describe('scoreRoster equals the model score', () => {
  const seeds = Array.from({ length: 14 }, (_, i) => i + 1);
  it.each(seeds.flatMap((seed) => [[seed, 'as drawn'], [seed, 'all soft']] as const))('random roster %i (%s), random assignments', (seed, variant) => {
    const r = variant === 'all soft' ? allSoft(randomRoster(seed)) : randomRoster(seed);
    const c = compileRoster(r);
    validateModel(c.model);
    for (let k = 0; k < 12; k++) {
      const x = randomValues(c, seed * 100 + k, k % 4 !== 0);
      const decoded = decodeAssignment(c, x);
      const s = scoreRoster(r, decoded.assignment);
      const m = score(c.model, x);
      if (s.total === -Infinity) expect(m).toBe(-Infinity);
      else expect(m).toBeCloseTo(s.total, 8);
      if (s.feasible) {
        feasibleSeen++;
        const mt = modelTerms(c, x);
        for (const t of TERM_NAMES) expect([t, mt[t]]).toEqual([t, expect.closeTo(s.terms[t], 8)]);
      }
      // round trip: the readable roster encodes back to the same values
      const enc = encodeAssignment(c, decoded.assignment);
      expect(enc.ok && Array.from(enc.values)).toEqual(Array.from(x));
    }
  });

  it('the random assignments above included feasible ones (per-term comparisons ran)', () => {
    expect(feasibleSeen).toBeGreaterThan(60);
  });

  it('agrees on the demo with the rules soft, for assignments with every term non-zero', () => {
    const soft = { hard: false, enabled: true };
    const r = makeWillowmereRoster({ rules: { minRest: { hard: false }, weeklyRest: soft, averageWeeklyHours: soft, nightAverage: soft, shiftsPerWindow: soft, maxHoursPer7Days: soft, nightShiftLength: { hours: 7 } } });
    const c = compileRoster(r);
    for (let k = 0; k < 4; k++) {
      const x = randomValues(c, 500 + k);
      const s = scoreRoster(r, decodeAssignment(c, x).assignment);
      expect(s.feasible).toBe(true);
      expect(score(c.model, x)).toBeCloseTo(s.total, 8);
      const nonZero = TERM_NAMES.filter((t) => s.terms[t] !== 0);
      expect(nonZero.length).toBeGreaterThanOrEqual(10);
    }
  });
});

