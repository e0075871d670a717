import { describe, expect, it } from 'vitest';
import { buildGrid, shiftBand, shiftMark, type GridShift } from '../../../shared/roster/grid-model';

// A three-day roster worked out by hand: two people, an early and a night shift each day.
const shifts: GridShift[] = [
  { id: 1, label: 'early', startsLocal: '2026-03-06T07:00', endsLocal: '2026-03-06T15:00', night: false, seats: [{ id: 11, skillId: 1 }, { id: 12, skillId: null }] },
  { id: 2, label: 'night', startsLocal: '2026-03-06T21:00', endsLocal: '2026-03-07T07:00', night: true, seats: [{ id: 21, skillId: null }] },
  { id: 3, label: 'early', startsLocal: '2026-03-07T07:00', endsLocal: '2026-03-07T15:00', night: false, seats: [{ id: 31, skillId: 1 }] },
  { id: 4, label: 'early', startsLocal: '2026-03-08T07:00', endsLocal: '2026-03-08T15:00', night: false, seats: [{ id: 41, skillId: 1 }] },
];
const people = [
  { id: 5, name: 'Ada', skillIds: [1], contractedHours: 20 },
  { id: 6, name: 'Bo', skillIds: [], contractedHours: null },
];
const base = () => ({
  periodStart: '2026-03-06',
  periodEnd: '2026-03-08',
  shifts,
  people,
  assignment: new Map<number, number | null>([[11, 5], [12, null], [21, 6], [31, 5], [41, null]]),
  skillName: (id: number | null) => (id === 1 ? 'nurse' : 'anyone'),
});

describe('buildGrid', () => {
  it('puts each seat in its person and day, and counts hours, nights and weekends', () => {
    const g = buildGrid(base());
    expect(g.days).toEqual(['2026-03-06', '2026-03-07', '2026-03-08']);
    const ada = g.rows.find((r) => r.person.id === 5)!;
    const bo = g.rows.find((r) => r.person.id === 6)!;
    expect(ada.cells.get('2026-03-06')!.seats.map((s) => s.seatId)).toEqual([11]);
    expect(ada.cells.get('2026-03-07')!.seats.map((s) => s.seatId)).toEqual([31]);
    expect(ada.hours).toBe(16);
    // 7 March 2026 is a Saturday.
    expect(ada.weekendShifts).toBe(1);
    expect(bo.hours).toBe(10);
    expect(bo.nights).toBe(1);
    expect(bo.cells.get('2026-03-07')!.seats).toEqual([]);
  });

  it('counts seats filled against needed by skill per day', () => {
    const g = buildGrid(base());
    expect(g.foot.get('2026-03-06')).toEqual([
      { skillId: null, skillName: 'anyone', filled: 1, needed: 2 },
      { skillId: 1, skillName: 'nurse', filled: 1, needed: 1 },
    ]);
    expect(g.foot.get('2026-03-08')).toEqual([{ skillId: 1, skillName: 'nurse', filled: 0, needed: 1 }]);
  });

  it('marks wishes honoured or not, shows approved absences only, and places breaches by seat', () => {
    const g = buildGrid({
      ...base(),
      wishes: [
        { personId: 5, date: '2026-03-06', shiftId: null, kind: 'avoid' }, // works: not honoured
        { personId: 5, date: '2026-03-08', shiftId: null, kind: 'cannot' }, // free: honoured
        { personId: 6, date: null, shiftId: 2, kind: 'prefer' }, // on that night: honoured
      ],
      absences: [
        { personId: 6, kind: 'annual', startDate: '2026-03-08', endDate: '2026-03-09', startTime: null, endTime: null, status: 'approved' },
        { personId: 5, kind: 'sick', startDate: '2026-03-07', endDate: '2026-03-07', startTime: null, endTime: null, status: 'requested' },
      ],
      violations: [
        { term: 'minRest', hard: false, points: -4, message: 'Ada rests 9 h', people: ['p5'], seats: ['st11', 'st31'] },
        { term: 'coverage', hard: false, points: -10, message: 'open seat', people: [], seats: ['st41'] },
        { term: 'contractedHours', hard: false, points: -2, message: 'Ada 4 h under', people: ['p5'], seats: ['st11', 'st31'] },
      ],
    });
    const ada = g.rows.find((r) => r.person.id === 5)!;
    const bo = g.rows.find((r) => r.person.id === 6)!;
    expect(ada.cells.get('2026-03-06')!.wishes).toEqual([{ kind: 'avoid', shiftLabel: null, honoured: false }]);
    expect(ada.cells.get('2026-03-08')!.wishes[0].honoured).toBe(true);
    expect(bo.cells.get('2026-03-06')!.wishes).toEqual([{ kind: 'prefer', shiftLabel: 'night', honoured: true }]);
    expect([ada.wishesHonoured, ada.wishesTotal, bo.wishesHonoured, bo.wishesTotal]).toEqual([1, 2, 1, 1]);
    expect(bo.cells.get('2026-03-08')!.absence?.kind).toBe('annual');
    expect(ada.cells.get('2026-03-07')!.absence).toBeNull();
    expect(ada.cells.get('2026-03-06')!.breaches.map((b) => b.term)).toEqual(['minRest']);
    expect(ada.cells.get('2026-03-07')!.breaches.map((b) => b.term)).toEqual(['minRest']);
    expect(g.dayBreaches.get('2026-03-08')!.map((b) => b.term)).toEqual(['coverage']);
    expect(ada.rowBreaches.map((b) => b.term)).toEqual(['contractedHours']);
  });

  it('prefers the run totals (they credit absences) over its own count', () => {
    const g = buildGrid({ ...base(), totals: [{ personId: 'p5', hours: 24, nights: 0, weekendShifts: 1, contractedHours: 22 }] });
    const ada = g.rows.find((r) => r.person.id === 5)!;
    expect([ada.hours, ada.contractedHours]).toEqual([24, 22]);
  });
});

describe('marks', () => {
  it('takes the first two letters of the shift label and a band from the start hour', () => {
    expect(shiftMark('early')).toBe('Ea');
    expect(shiftMark('Spät-dienst')).toBe('Sp');
    expect(shiftMark('  ')).toBe('•');
    expect(shiftBand({ startsLocal: '2026-03-06T07:00', endsLocal: '2026-03-06T15:00', night: false })).toBe('morning');
    expect(shiftBand({ startsLocal: '2026-03-06T13:00', endsLocal: '2026-03-06T21:00', night: null })).toBe('afternoon');
    expect(shiftBand({ startsLocal: '2026-03-06T17:00', endsLocal: '2026-03-06T23:00', night: null })).toBe('evening');
    expect(shiftBand({ startsLocal: '2026-03-06T21:00', endsLocal: '2026-03-07T07:00', night: null })).toBe('night');
    expect(shiftBand({ startsLocal: '2026-03-06T07:00', endsLocal: '2026-03-06T15:00', night: true })).toBe('night');
  });
});
