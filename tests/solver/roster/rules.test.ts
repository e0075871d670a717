/**
 * Each rule against worked examples built by hand from the articles of EU Directive
 * 2003/88/EC (or marked as common practice with no source). Every example is scored twice,
 * by the independent scorer and through the compiled model, and the two must agree.
 */
import { describe, expect, it } from 'vitest';
import { rosterSchema, type RosterInput } from '../../../shared/roster/schema';
import { compileRoster } from '../../../solver/roster/compile';
import { scoreRoster } from '../../../solver/roster/score-roster';
import { all, both, days, roster, type ShiftSpec } from './rule-helpers';

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

  // The autumn change (Summer Time Order 2002; Directive 2000/84/EC Art. 2: the last Sunday of
  // October, 01:00 UTC): on Sun 31 Oct 2027 London's clocks go from 02:00 BST back to 01:00 GMT,
  // so the wall clock shows 01:00–02:00 twice and the night has an hour more than it shows.
  const autumn = { period: { start: '2027-10-30', end: '2027-10-31', timeZone: 'Europe/London' } };
  it('counts the real gap across the autumn DST change (UK, 31 Oct 2027): 11 h where the clock shows 10', () => {
    const late: ShiftSpec = ['late', 'late', '2027-10-30T14:00', '2027-10-30T22:00'];
    // 22:00 BST = 21:00 UTC; 08:00 GMT = 08:00 UTC: 11 h elapsed, exactly the minimum, allowed
    const kept = roster([late, ['early', 'early', '2027-10-31T08:00', '2027-10-31T16:00']], { minRest: { hard: true } }, autumn);
    const s = both(kept, all(kept, 'ada'));
    expect(s.feasible).toBe(true);
    expect(s.violations).toEqual([]);
    // 07:30 GMT = 07:30 UTC: 10.5 h elapsed (the clock says 9.5 h)
    const short = roster([late, ['early', 'early', '2027-10-31T07:30', '2027-10-31T15:30']], { minRest: { hard: false, weight: 1 } }, autumn);
    expect(both(short, all(short, 'ada')).violations.map((v) => v.message)).toEqual([
      'Ada Brook: 10.5 h rest between the late shift on Sat 30 Oct and the early shift on Sun 31 Oct; minimum 11 h',
    ]);
  });
  it('a shift ending in the repeated hour ends at its second (GMT) occurrence, as documented in shared/roster/time.ts', () => {
    // 01:30 on 31 Oct read as 01:30 GMT = 01:30 UTC; the next start 12:00 GMT = 12:00 UTC: 10.5 h
    // (the first, BST occurrence would have left 11.5 h)
    const r = roster(
      [
        ['late', 'late', '2027-10-30T17:30', '2027-10-31T01:30'],
        ['day', 'day', '2027-10-31T12:00', '2027-10-31T20:00'],
      ],
      { minRest: { hard: true } },
      autumn,
    );
    expect(both(r, all(r, 'ada')).feasible).toBe(false);
    expect(both(r, { 'late#1': 'ada', 'day#1': 'ben' }).feasible).toBe(true);
    // 12:30 UTC leaves exactly 11 h
    const later = roster(
      [
        ['late', 'late', '2027-10-30T17:30', '2027-10-31T01:30'],
        ['day', 'day', '2027-10-31T12:30', '2027-10-31T20:30'],
      ],
      { minRest: { hard: true } },
      autumn,
    );
    expect(both(later, all(later, 'ada')).feasible).toBe(true);
  });
});

// Directive 2003/88/EC, Art. 5: "per each seven-day period, every worker is entitled to a minimum
// uninterrupted rest period of 24 hours plus the 11 hours' daily rest referred to in Article 3"
// (35 h in one stretch); Art. 16(a): a reference period of up to 14 days. Checked in every 7-day
// window inside the period, in real time.
describe('weekly rest (Art. 5 with Art. 16(a): 24 h + 11 h uninterrupted in every 7 days)', () => {
  const rules = { weeklyRest: { hard: false, weight: 10 } };
  it('Mon–Fri 07:00–15:00 leaves Fri 15:00 → Sun 24:00 = 57 h inside the week: kept', () => {
    const r = roster(days(5, '07:00', '15:00'), rules);
    expect(both(r, all(r, 'ada')).violations).toEqual([]);
  });
  it('Mon–Sat 07:00–15:00 leaves 33 h inside Mon 4–Sun 10 Jan, 2 h short of 35: broken once', () => {
    const r = roster(days(6, '07:00', '15:00'), rules);
    const s = both(r, all(r, 'ada'));
    expect(s.terms.weeklyRest).toBe(-10);
    expect(s.violations.map((v) => v.message)).toEqual(['Ada Brook: longest rest 33 h in the 7 days Mon 4 Jan–Sun 10 Jan; needs 35 h']);
  });
  it('seven days in a row break the Mon–Sun and the Tue–Mon windows; Wed–Tue has Sun 15:00 → Tue 24:00 = 57 h', () => {
    const r = roster(days(7, '07:00', '15:00'), rules);
    const s = both(r, all(r, 'ada'));
    expect(s.terms.weeklyRest).toBe(-20);
    expect(s.violations.map((v) => v.message)).toContain('Ada Brook: longest rest 33 h in the 7 days Tue 5 Jan–Mon 11 Jan; needs 35 h');
  });
  it('a rest of exactly 35 h is enough: Sat 13:00 → Mon 00:00 with a night into Sat 13:00', () => {
    // Mon 4 – Fri 8 day shifts, then Fri 22:00 → Sat 13:00 (15 h, a long shift; only weekly rest is on)
    const shifts: ShiftSpec[] = [...days(4, '07:00', '15:00'), ['long', 'long', '2027-01-08T22:00', '2027-01-09T13:00']];
    const r = roster(shifts, rules, { period: { start: '2027-01-04', end: '2027-01-10', timeZone: 'Europe/London' } });
    expect(both(r, all(r, 'ada')).violations).toEqual([]);
  });
  it('Art. 16(a): over a 14-day reference period one 35 h rest is asked; 13 days in a row leave 33 h', () => {
    const r = roster(days(13, '07:00', '15:00'), { weeklyRest: { hard: false, weight: 10, days: 14 } });
    const s = both(r, all(r, 'ada'));
    expect(s.terms.weeklyRest).toBe(-10);
    const twelve = roster(days(12, '07:00', '15:00'), { weeklyRest: { hard: false, weight: 10, days: 14 } });
    expect(both(twelve, all(twelve, 'ada')).violations).toEqual([]); // Fri 15:00 → Sun 24:00 = 57 h
  });
  it('a roster shorter than the 7-day period is not held to it: 3 days of 08:00–16:00 keep it', () => {
    // Art. 5 asks for the rest "per each seven-day period"; in a 3-day roster it may fall outside
    const r = roster(days(3, '08:00', '16:00'), { weeklyRest: { hard: true } }, { period: { start: '2027-01-04', end: '2027-01-06', timeZone: 'Europe/London' } });
    expect(both(r, all(r, 'ada')).feasible).toBe(true);
  });
  it('hard: a roster without the rest is infeasible, and two people sharing the week keep it', () => {
    const r = roster(days(7, '07:00', '15:00'), { weeklyRest: { hard: true } });
    expect(both(r, all(r, 'ada')).feasible).toBe(false);
    const a = all(r, 'ada');
    a['day6#1'] = 'ben';
    a['day7#1'] = 'ben';
    expect(both(r, a).feasible).toBe(true);
  });
});

// Art. 6(b): "the average working time for each seven-day period, including overtime, does not
// exceed 48 hours"; Art. 16(b): averaged over a reference period of up to four months, with paid
// annual leave and sick leave "neutral" (here: counted at the hours they credit).
describe('average weekly working time (Art. 6 with Art. 16(b): 48 h on average)', () => {
  const fortnight = (n1: number, n2: number): ShiftSpec[] => [...days(n1, '07:00', '17:00', 'w1', 4), ...days(n2, '07:00', '17:00', 'w2', 11)];
  it('60 h then 30 h is 90 h over 14 days, an average of 45 h: kept (a 7-day cap would count 12 h over)', () => {
    const r = roster(fortnight(6, 3), { averageWeeklyHours: { hard: false, weight: 1 } });
    expect(both(r, all(r, 'ada')).violations).toEqual([]);
    const capped = roster(fortnight(6, 3), { maxHoursPer7Days: { hard: false, weight: 1 } });
    // local policy, stricter: every rolling window is held to 48 h (12 h over in Mon 4–Sun 10 alone)
    const c = both(capped, all(capped, 'ada'));
    expect(c.violations.map((v) => v.message)).toContainEqual(expect.stringContaining('60 h in the 7 days Mon 4 Jan–Sun 10 Jan'));
    expect(c.terms.maxHoursPer7Days).toBeLessThan(-12);
  });
  it('60 h then 40 h is 100 h against 96 h (48 × 14 / 7): 4 h over, per hour', () => {
    const r = roster(fortnight(6, 4), { averageWeeklyHours: { hard: false, weight: 3 } });
    const s = both(r, all(r, 'ada'));
    expect(s.terms.averageWeeklyHours).toBe(-12);
    expect(s.violations[0].message).toContain('100 h in the 14 days');
  });
  it('a reference period of 7 days rolls: 60 h in Mon 4–Sun 10 is 12 h over, 50 h in Tue 5–Mon 11 is 2 h', () => {
    const r = roster(fortnight(6, 0), { averageWeeklyHours: { hard: false, weight: 1, referenceDays: 7 } });
    expect(both(r, all(r, 'ada')).terms.averageWeeklyHours).toBe(-14);
  });
  it('credited leave counts: 90 h worked + a day of annual leave crediting 8 h = 98 h, 2 h over 96', () => {
    const r = roster(fortnight(6, 3), { averageWeeklyHours: { hard: false, weight: 1 } }, {
      absences: [{ person: 'ada', kind: 'annual', start: '2027-01-15T00:00', end: '2027-01-16T00:00', creditHours: 8 }],
    });
    expect(both(r, all(r, 'ada')).terms.averageWeeklyHours).toBe(-2);
  });
});

// Local policies with no source (common practice): a rolling 7-day hours cap, shifts per window.
describe('local policies (no source): hours in any 7 days, shifts per window', () => {
  it('5 × 10 h = 50 h in 7 days is 2 h over 48 (per hour, soft); hard is infeasible', () => {
    const r = roster(days(5, '07:00', '17:00'), { maxHoursPer7Days: { hard: false, weight: 3 } });
    expect(both(r, all(r, 'ada')).terms.maxHoursPer7Days).toBe(-6);
    const hard = roster(days(5, '07:00', '17:00'), { maxHoursPer7Days: { hard: true } });
    expect(both(hard, all(hard, 'ada')).feasible).toBe(false);
  });
  it('at most 6 shifts in 7 days: windows roll, days 2–8 are a window too', () => {
    const r = roster(days(8, '07:00', '15:00'), { shiftsPerWindow: { hard: false, weight: 1 } });
    const a = all(r, 'ada');
    a['day1#1'] = 'ben';
    const s = both(r, a);
    expect(s.terms.shiftsPerWindow).toBe(-1);
    expect(s.violations[0].message).toContain('Tue 5 Jan–Mon 11 Jan');
  });
});

// Art. 8(a): "normal hours of work for night workers do not exceed an average of eight hours in any
// 24-hour period"; the weekly rest days are left out of the average (Art. 16(c), from memory).
describe('night work average (Art. 8)', () => {
  const nights = (n: number): ShiftSpec[] => days(n, '20:00', '08:00', 'night');
  const nightRoster = (n: number, extra: Partial<RosterInput> = {}) => {
    const shifts = nights(n).map(([id, , start, end]) => ({ id, patternLabel: 'night', start, end, night: true }));
    return roster(nights(n), { nightAverage: { hard: false, weight: 1, referenceDays: 7 } }, { shifts, ...extra });
  };
  it('7 days hold 8 h × 6 = 48 h for a night worker: four 12 h nights are 48 h, kept; five are 60 h, 12 h over', () => {
    const four = nightRoster(4);
    expect(both(four, all(four, 'ada')).violations).toEqual([]);
    const five = nightRoster(5);
    expect(both(five, all(five, 'ada')).terms.nightAverage).toBe(-12);
  });
  it('someone on a hard no-nights term is no night worker and is not held to it', () => {
    const five = nightRoster(5);
    const r = rosterSchema.parse({ ...five, people: five.people.map((p) => (p.id === 'ben' ? { ...p, terms: [{ kind: 'noNights', hard: true, weight: 0 }] } : p)) });
    // Ben cannot take the nights at all (hard term): every seat open or Ada's
    expect(both(r, all(r, 'ada')).terms.nightAverage).toBe(-12);
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
