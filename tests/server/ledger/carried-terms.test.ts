/**
 * The ledger's look-back as terms of the next roster (server/ledger/terms.ts carriedTerms), on a
 * worked example whose figures are written out below: weekends are counted as weekends (what the
 * maxWeekends term counts, checked with scoreRoster), not as weekend shifts.
 */
import { describe, expect, it } from 'vitest';
import { RULE_NAMES, rosterSchema, type Roster } from '../../../shared/roster/schema';
import type { LedgerAnswer, LedgerCounts } from '../../../shared/api/ledger';
import { carriedTerms } from '../../../server/ledger/terms';
import { zeroCounts } from '../../../server/ledger/count';
import { scoreRoster } from '../../../solver/roster/score-roster';

/** Four weeks from Mon 4 Jan 2027, one 07:00–15:00 shift a day with two seats; four people on 30 h. */
function fourWeeks(): Roster {
  const shifts = Array.from({ length: 28 }, (_, i) => {
    const d = new Date(Date.UTC(2027, 0, 4 + i)).toISOString().slice(0, 10);
    return { id: `sh${i + 1}`, patternLabel: 'early', start: `${d}T07:00`, end: `${d}T15:00` };
  });
  return rosterSchema.parse({
    period: { start: '2027-01-04', end: '2027-01-31', timeZone: 'Europe/London' },
    skills: [],
    people: [1, 2, 3, 4].map((n) => ({ id: `p${n}`, name: `Person ${n}`, skills: [], contractedHoursPerWeek: 30 })),
    shifts,
    seats: shifts.flatMap((s) => [{ id: `${s.id}#1`, shift: s.id }, { id: `${s.id}#2`, shift: s.id }]),
    rules: Object.fromEntries(RULE_NAMES.map((id) => [id, { enabled: false }])),
  });
}

const earlierPerson = (personId: number, counts: Partial<LedgerCounts>): LedgerAnswer['people'][number] => ({
  personId,
  name: `Person ${personId}`,
  totals: { ...zeroCounts(), shifts: 12, hours: 96, contractHours: 120, ...counts },
  byPeriod: [],
});

describe('carried terms from the ledger', () => {
  // Look-back: person 1 worked 4 weekends with one shift each; persons 2–4 two weekends with both
  // days (4 weekend shifts each). In weekend shifts nobody is over (16 shared by four: 4 each);
  // in weekends person 1 is: 10 shared by four is 2.5, and 4 − 2.5 rounds down to 1 over.
  const earlier = [
    earlierPerson(1, { weekendShifts: 4, weekendsWorked: 4 }),
    ...[2, 3, 4].map((id) => earlierPerson(id, { weekendShifts: 4, weekendsWorked: 2 })),
  ];

  it('gives who worked more weekends than their share "at most (share − over) weekends", in weekends', () => {
    const roster = fourWeeks();
    const terms = carriedTerms(roster, earlier, { nightWeight: 4, weekendWeight: 3 });
    // This period: 8 weekend days × 2 seats = 16 weekend shifts, 4 each by contract; the team
    // worked 16 / 10 = 1.6 weekend shifts per weekend, so 4 shifts are ⌈2.5⌉ = 3 weekends; 3 − 1 = 2.
    expect(Object.fromEntries(terms)).toEqual({ p1: [{ kind: 'maxWeekends', count: 2, hard: false, weight: 3 }] });

    // The term counts weekends: person 1 on the Saturdays of three weekends is one over (−3 points), on two none.
    const withTerms = rosterSchema.parse({ ...roster, people: roster.people.map((p) => ({ ...p, terms: terms.get(p.id) })) });
    const saturdays = ['sh6#1', 'sh13#1', 'sh20#1'];
    const on = (seats: string[]) => Object.fromEntries(withTerms.seats.map((s, i) => [s.id, seats.includes(s.id) ? 'p1' : `p${2 + (i % 3)}`]));
    const weekendPoints = (seats: string[]) => scoreRoster(withTerms, on(seats)).violations.filter((v) => v.term === 'maxWeekends').reduce((a, v) => a + v.points, 0);
    expect(weekendPoints(saturdays)).toBe(-3);
    expect(weekendPoints(saturdays.slice(0, 2))).toBe(0);
  });

  it('carries nothing when everyone is at or under their share, or the weights are 0', () => {
    const even = [1, 2, 3, 4].map((id) => earlierPerson(id, { weekendShifts: 4, weekendsWorked: 2, nights: 3 }));
    expect(carriedTerms(fourWeeks(), even, { nightWeight: 4, weekendWeight: 3 }).size).toBe(0);
    expect(carriedTerms(fourWeeks(), earlier, { nightWeight: 4, weekendWeight: 0 }).size).toBe(0);
  });
});
