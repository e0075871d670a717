/**
 * Each rule against worked examples built by hand from the articles of EU Directive
 * 2003/88/EC (or marked as common practice with no source). Every example is scored twice,
 * by the independent scorer and through the compiled model, and the two must agree.
 */
import { describe, expect, it } from 'vitest';
import { rosterSchema, type Roster, type RosterAssignment, type RosterInput } from '../../../shared/roster/schema';
import { compileRoster, modelTerms } from '../../../solver/roster/compile';
import { encodeAssignment } from '../../../solver/roster/decode';
import { scoreRoster } from '../../../solver/roster/score-roster';
import { score } from '../../../solver/model';

type ShiftSpec = [id: string, label: string, start: string, end: string];

/** Everything off but the rules named; one seat per shift; people with no skills needed. */
function roster(shifts: ShiftSpec[], rules: RosterInput['rules'], extra: Partial<RosterInput> = {}): Roster {
  const off = { enabled: false };
  return rosterSchema.parse({
    period: { start: '2027-01-04', end: '2027-01-17', timeZone: 'Europe/London' },
    skills: [{ id: 'fa', name: 'First aid' }],
    people: [
      { id: 'ada', name: 'Ada Brook', skills: ['fa'] },
      { id: 'ben', name: 'Ben Carrow', skills: [] },
    ],
    shifts: shifts.map(([id, patternLabel, start, end]) => ({ id, patternLabel, start, end })),
    seats: shifts.map(([id]) => ({ id: `${id}#1`, shift: id })),
    ...extra,
    rules: {
      coverage: off, minRest: off, weeklyRest: off, maxHoursPer7Days: off, nightShiftLength: off, maxConsecutiveDays: off,
      maxNightsInRow: off, contractedHours: off, fairNights: off, fairWeekends: off, skillMix: off,
      ...rules,
    },
  });
}

/** Score with both evaluators; they must agree, total and per term. */
function both(r: Roster, a: RosterAssignment) {
  const s = scoreRoster(r, a);
  const c = compileRoster(r);
  const enc = encodeAssignment(c, a);
  expect(enc.ok).toBe(true);
  if (enc.ok) {
    expect(score(c.model, enc.values)).toBe(s.total);
    if (s.feasible) {
      const mt = modelTerms(c, enc.values);
      for (const [t, v] of Object.entries(s.terms)) expect(mt[t as keyof typeof mt]).toBeCloseTo(v, 9);
    }
  }
  return s;
}

const all = (r: Roster, who: string | null): RosterAssignment => Object.fromEntries(r.seats.map((s) => [s.id, who]));
const days = (n: number, start: string, end: string, label = 'day', from = 4): ShiftSpec[] =>
  Array.from({ length: n }, (_, i) => {
    const d = String(from + i).padStart(2, '0');
    const endDay = end < start ? String(from + i + 1).padStart(2, '0') : d;
    return [`${label}${i + 1}`, label, `2027-01-${d}T${start}`, `2027-01-${endDay}T${end}`];
  });

describe('minimum rest between shifts (Art. 3: 11 consecutive hours in every 24)', () => {
  const late: ShiftSpec = ['late', 'late', '2027-01-04T14:30', '2027-01-04T22:30'];
  it('a late ending 22:30 and an early at 07:00 leaves 8.5 h: broken, in words naming the person', () => {
    const r = roster([late, ['early', 'early', '2027-01-05T07:00', '2027-01-05T15:00']], { minRest: { hard: false, weight: 20 } });
    const s = both(r, all(r, 'ada'));
    expect(s.terms.minRest).toBe(-20);
    expect(s.violations.map((v) => v.message)).toEqual([
      'Ada Brook: 8.5 h rest between the late shift on Mon 4 Jan and the early shift on Tue 5 Jan; minimum 11 h',
    ]);
    const hard = roster([late, ['early', 'early', '2027-01-05T07:00', '2027-01-05T15:00']], { minRest: { hard: true } });
    expect(both(hard, all(hard, 'ada')).feasible).toBe(false);
    expect(both(hard, { 'late#1': 'ada', 'early#1': 'ben' }).feasible).toBe(true);
  });
  it('an early at 09:30 leaves exactly 11 h: allowed', () => {
    const r = roster([late, ['early', 'early', '2027-01-05T09:30', '2027-01-05T17:30']], { minRest: { hard: true } });
    const s = both(r, all(r, 'ada'));
    expect(s.feasible).toBe(true);
    expect(s.violations).toEqual([]);
  });
  it('counts the real gap across the spring DST change (UK, 28 Mar 2027)', () => {
    const r = roster(
      [
        ['late', 'late', '2027-03-27T14:00', '2027-03-27T22:00'],
        ['early', 'early', '2027-03-28T09:30', '2027-03-28T17:30'],
      ],
      { minRest: { hard: false, weight: 1 } },
      { period: { start: '2027-03-27', end: '2027-03-28', timeZone: 'Europe/London' } },
    );
    // 22:00 GMT to 09:30 BST is 10.5 h, not the 11.5 h the wall clock suggests
    expect(both(r, all(r, 'ada')).violations[0].message).toContain('10.5 h rest');
  });
});

describe('weekly rest (Art. 5) and maximum weekly hours (Art. 6)', () => {
  const rules = { weeklyRest: { hard: false, weight: 10 }, maxHoursPer7Days: { hard: false, weight: 1 } };
  it('6 × 8 h days in 7 is 48 h and allowed', () => {
    const r = roster(days(6, '07:00', '15:00'), rules);
    const s = both(r, all(r, 'ada'));
    expect(s.violations).toEqual([]);
  });
  it('a 7th day in a row breaks the weekly rest and the 48 h', () => {
    const r = roster(days(7, '07:00', '15:00'), rules);
    const s = both(r, all(r, 'ada'));
    expect(s.terms.weeklyRest).toBe(-10); // 7 shifts in one 7-day window, 1 over 6
    expect(s.terms.maxHoursPer7Days).toBe(-8); // 56 h, 8 h over 48
    expect(s.violations.map((v) => v.message)).toContain('Ada Brook: 7 shifts in the 7 days Mon 4 Jan–Sun 10 Jan, no day for the weekly rest; at most 6');
  });
  it('5 × 10 h = 50 h in 7 days is 2 h over 48 (per hour, soft)', () => {
    const r = roster(days(5, '07:00', '17:00'), { maxHoursPer7Days: { hard: false, weight: 3 } });
    expect(both(r, all(r, 'ada')).terms.maxHoursPer7Days).toBe(-6);
    const hard = roster(days(5, '07:00', '17:00'), { maxHoursPer7Days: { hard: true } });
    expect(both(hard, all(hard, 'ada')).feasible).toBe(false);
  });
  it('windows roll: days 2–8 are a window too', () => {
    // 8 days, off on day 1 only for Ben's half: Ada works days 2..8 → 7 in the window Tue–Mon
    const r = roster(days(8, '07:00', '15:00'), { weeklyRest: { hard: false, weight: 1 } });
    const a = all(r, 'ada');
    a['day1#1'] = 'ben';
    const s = both(r, a);
    expect(s.terms.weeklyRest).toBe(-1);
    expect(s.violations[0].message).toContain('Tue 5 Jan–Mon 11 Jan');
  });
});

describe('night shift length (Art. 8: 8 h on average per 24 h)', () => {
  it('a 9 h night (22:00–07:00) breaks it; an 8 h night (23:00–07:00) does not', () => {
    const r = roster(
      [
        ['n1', 'night', '2027-01-04T22:00', '2027-01-05T07:00'],
        ['n2', 'night', '2027-01-06T23:00', '2027-01-07T07:00'],
      ],
      { nightShiftLength: { hard: false, weight: 4 } },
    );
    const s = both(r, all(r, 'ada'));
    expect(s.terms.nightShiftLength).toBe(-4);
    expect(s.violations[0].message).toBe('Ada Brook works the night shift on Mon 4 Jan, a 9 h night; at most 8 h');
  });
});

describe('common practice (no source): consecutive days, nights in a row', () => {
  it('6 days in a row against a limit of 5 is one over; a day off resets', () => {
    const r = roster(days(6, '07:00', '15:00'), { maxConsecutiveDays: { hard: false, weight: 2, days: 5 } });
    expect(both(r, all(r, 'ada')).terms.maxConsecutiveDays).toBe(-2);
    const a = all(r, 'ada');
    a['day3#1'] = 'ben';
    expect(both(r, a).terms.maxConsecutiveDays).toBe(0);
  });
  it('5 nights in a row against 4 is one over; day shifts do not count as nights', () => {
    const r = roster([...days(5, '23:00', '07:00', 'night'), ...days(2, '07:00', '15:00', 'early', 10)], { maxNightsInRow: { hard: false, weight: 3, nights: 4 } });
    const s = both(r, all(r, 'ada'));
    expect(s.terms.maxNightsInRow).toBe(-3);
  });
});

describe('common practice (no source): contracted hours, fair nights and weekends, skill mix', () => {
  it('contracted hours: 3 × 8 h against 37.5 h/week over one week is 13.5 h under, 5.5 h past an 8 h tolerance', () => {
    const r = roster(days(3, '07:00', '15:00'), { contractedHours: { hard: false, weight: 0.5, toleranceHours: 8 } }, {
      period: { start: '2027-01-04', end: '2027-01-10', timeZone: 'Europe/London' },
      people: [
        { id: 'ada', name: 'Ada Brook', skills: ['fa'], contractedHoursPerWeek: 37.5 },
        { id: 'ben', name: 'Ben Carrow', skills: [] },
      ],
    });
    const s = both(r, all(r, 'ada'));
    expect(s.terms.contractedHours).toBeCloseTo(-0.5 * 5.5, 12);
    // Ben has no contract: no target
    expect(s.violations.every((v) => v.people.includes('ada'))).toBe(true);
  });
  it('fair nights: 4 nights between two equal people is 2 each; 3 is one over', () => {
    const r = roster(days(4, '23:00', '07:00', 'night'), { fairNights: { hard: false, weight: 3 } });
    const a = all(r, 'ada');
    a['night4#1'] = 'ben';
    const s = both(r, a);
    expect(s.terms.fairNights).toBe(-3);
    expect(s.violations[0].message).toBe('Ada Brook: 3 night shifts; fair share is 2');
  });
  it('fair weekends: Sat 9 and Sun 10 Jan 2027 are weekend days, Fri 8 is not', () => {
    const r = roster(days(3, '07:00', '15:00', 'd', 8), { fairWeekends: { hard: false, weight: 1 } });
    const s = both(r, all(r, 'ada'));
    // 2 weekend seats, share 1 each: Ada has 2
    expect(s.terms.fairWeekends).toBe(-1);
  });
  it('skill mix: a shift needing one first-aider with none is one short', () => {
    const r = roster(days(1, '07:00', '15:00'), { skillMix: { hard: false, weight: 10, requirements: [{ skill: 'fa', min: 1 }] } });
    expect(both(r, all(r, 'ben')).terms.skillMix).toBe(-10);
    expect(both(r, all(r, 'ada')).terms.skillMix).toBe(0);
  });
});

describe('coverage, wishes, pairings, pins', () => {
  it('an open seat costs the coverage weight; hard coverage makes it infeasible', () => {
    const r = roster(days(2, '07:00', '15:00'), { coverage: { hard: false, weight: 100 } });
    expect(both(r, { 'day1#1': 'ada', 'day2#1': null }).terms.coverage).toBe(-100);
    const hard = roster(days(2, '07:00', '15:00'), { coverage: { hard: true } });
    expect(scoreRoster(hard, { 'day1#1': 'ada' }).feasible).toBe(false);
  });
  it('prefer adds, avoid subtracts, cannot forbids; a date wish covers every shift that day', () => {
    const r = roster(days(2, '07:00', '15:00'), {}, {
      wishes: [
        { person: 'ada', shift: 'day1', kind: 'prefer', strength: 3 },
        { person: 'ada', date: '2027-01-05', kind: 'avoid', strength: 2 },
        { person: 'ben', date: '2027-01-04', kind: 'cannot' },
      ],
    });
    expect(both(r, all(r, 'ada')).terms.wishes).toBe(1);
    const bad = scoreRoster(r, all(r, 'ben'));
    expect(bad.feasible).toBe(false);
    expect(bad.violations.find((v) => v.hard)!.message).toBe('Ben Carrow cannot work on Mon 4 Jan but is on the day shift on Mon 4 Jan');
  });
  it('a pairing scores once per shared shift; never-together is hard', () => {
    const two: ShiftSpec[] = days(2, '07:00', '15:00');
    const base = {
      period: { start: '2027-01-04', end: '2027-01-10', timeZone: 'Europe/London' },
      shifts: two.map(([id, patternLabel, start, end]) => ({ id, patternLabel, start, end })),
      seats: two.flatMap(([id]) => [{ id: `${id}#1`, shift: id }, { id: `${id}#2`, shift: id }]),
    };
    const r = roster(two, {}, { ...base, pairings: [{ a: 'ada', b: 'ben', score: 4 }] });
    const a = { 'day1#1': 'ada', 'day1#2': 'ben', 'day2#1': 'ben', 'day2#2': null };
    expect(both(r, a).terms.pairings).toBe(4);
    const n = roster(two, {}, { ...base, pairings: [{ a: 'ada', b: 'ben', never: true }] });
    expect(both(n, a).feasible).toBe(false);
  });
  it('a seat pinned to someone must hold them', () => {
    const r = roster(days(1, '07:00', '15:00'), {}, { pins: [{ seat: 'day1#1', person: 'ben' }] });
    expect(scoreRoster(r, all(r, 'ada')).feasible).toBe(false);
    expect(both(r, all(r, 'ben')).feasible).toBe(true);
    expect(compileRoster(r).domains[0]).toEqual([1]);
  });
  it('double booking: two overlapping shifts for one person is always infeasible', () => {
    const r = roster(
      [
        ['a', 'early', '2027-01-04T07:00', '2027-01-04T15:00'],
        ['b', 'mid', '2027-01-04T12:00', '2027-01-04T20:00'],
      ],
      {},
    );
    expect(both(r, all(r, 'ada')).violations[0]).toMatchObject({ term: 'doubleBooking', hard: true });
  });
});
