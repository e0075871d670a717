import { describe, expect, it } from 'vitest';
import { generateShifts } from '../../shared/roster/patterns';
import { shiftPatternSchema, type Period } from '../../shared/roster/schema';
import { isNightShift, shiftFacts } from '../../shared/roster/derive';

const london = (start: string, end: string): Period => ({ start, end, timeZone: 'Europe/London' });
const pattern = (p: Parameters<typeof shiftPatternSchema.parse>[0]) => shiftPatternSchema.parse(p);

describe('generateShifts', () => {
  it('generates one shift per matching weekday with its seats', () => {
    // 2027-01-04 is a Monday (checked by the calendar, not by date-fns: 1 Jan 2027 is a Friday)
    const { shifts, seats } = generateShifts(
      [pattern({ label: 'early', weekdays: ['mon', 'wed'], start: '07:00', end: '15:00', seats: [{ skill: 'med', count: 1 }, { skill: null, count: 2 }] })],
      london('2027-01-04', '2027-01-10'),
    );
    expect(shifts.map((s) => s.id)).toEqual(['early-2027-01-04', 'early-2027-01-06']);
    expect(shifts[0]).toMatchObject({ start: '2027-01-04T07:00', end: '2027-01-04T15:00', patternLabel: 'early' });
    expect(seats.filter((s) => s.shift === 'early-2027-01-04').map((s) => s.skill)).toEqual(['med', null, null]);
  });

  it('ends a pattern crossing midnight on the next day', () => {
    const { shifts } = generateShifts([pattern({ label: 'night', weekdays: ['sun'], start: '22:00', end: '06:00', seats: [{ count: 1 }] })], london('2027-01-04', '2027-01-10'));
    expect(shifts).toHaveLength(1);
    expect(shifts[0]).toMatchObject({ start: '2027-01-10T22:00', end: '2027-01-11T06:00' });
  });

  it('counts the real length of nights across DST changes (UK: last Sunday of March and October)', () => {
    const night = pattern({ label: 'night', weekdays: ['sat'], start: '22:00', end: '06:00', seats: [{ count: 1 }] });
    // Clocks go forward 01:00→02:00 GMT on 28 Mar 2027 and back 02:00→01:00 BST on 31 Oct 2027.
    const spring = generateShifts([night], london('2027-03-27', '2027-03-27'));
    const autumn = generateShifts([night], london('2027-10-30', '2027-10-30'));
    const hours = (g: ReturnType<typeof generateShifts>, start: string) =>
      shiftFacts({ period: { ...london(start, start) }, shifts: g.shifts })[0].hours;
    expect(hours(spring, '2027-03-27')).toBe(7);
    expect(hours(autumn, '2027-10-30')).toBe(9);
    // Same pattern in a zone without DST stays 8 h.
    const utc = generateShifts([night], { start: '2027-03-27', end: '2027-03-27', timeZone: 'UTC' });
    expect(shiftFacts({ period: { start: '2027-03-27', end: '2027-03-27', timeZone: 'UTC' }, shifts: utc.shifts })[0].hours).toBe(8);
  });

  it('moves a start time that the spring change skips to the time the clock shows', () => {
    const p = pattern({ label: 'small-hours', weekdays: ['sun'], start: '01:30', end: '05:30', seats: [{ count: 1 }] });
    const { shifts } = generateShifts([p], london('2027-03-28', '2027-03-28'));
    // 01:30 does not exist in London that night; 00:30 GMT + 1 h of clock change reads 02:30 BST
    expect(shifts[0].start).toBe('2027-03-28T02:30');
    expect(shiftFacts({ period: london('2027-03-28', '2027-03-28'), shifts })[0].hours).toBe(3);
  });

  it('rejects two patterns with one label (their shift ids would collide)', () => {
    const p = pattern({ label: 'early', weekdays: ['mon'], start: '07:00', end: '15:00', seats: [{ count: 1 }] });
    expect(() => generateShifts([p, p], london('2027-01-04', '2027-01-04'))).toThrow(/early/);
  });
});

describe('night shifts (Art. 2: night time includes 00:00–05:00; a night worker works 3 h of it)', () => {
  it.each([
    ['2027-01-04T23:00', '2027-01-05T07:00', true],
    ['2027-01-04T22:00', '2027-01-05T06:00', true],
    ['2027-01-04T07:00', '2027-01-04T15:00', false],
    ['2027-01-04T15:00', '2027-01-04T23:00', false],
    // 2.5 h inside 23:00–06:00: below the 3 h of Art. 2(4)(a)
    ['2027-01-04T17:30', '2027-01-05T01:30', false],
    ['2027-01-05T03:00', '2027-01-05T11:00', true],
  ])('%s → %s night: %s', (start, end, night) => {
    expect(isNightShift({ start, end })).toBe(night);
  });
  it('an explicit flag wins', () => {
    expect(isNightShift({ start: '2027-01-04T07:00', end: '2027-01-04T15:00', night: true })).toBe(true);
  });
});
