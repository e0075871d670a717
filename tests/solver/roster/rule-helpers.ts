/**
 * Small rosters for rule and term examples (rules.test.ts, absences-terms.test.ts): every rule
 * off but those named, two people, one seat per shift, scored by both evaluators.
 */
import { expect } from 'vitest';
import { RULE_NAMES, rosterSchema, type Roster, type RosterAssignment, type RosterInput } from '../../../shared/roster/schema';
import { compileRoster, modelTerms } from '../../../solver/roster/compile';
import { encodeAssignment } from '../../../solver/roster/decode';
import { scoreRoster } from '../../../solver/roster/score-roster';
import { score } from '../../../solver/model';

export type ShiftSpec = [id: string, label: string, start: string, end: string];

/** Every rule off but the rules named (those on); one seat per shift; people with no skills needed. */
export function roster(shifts: ShiftSpec[], rules: RosterInput['rules'], extra: Partial<RosterInput> = {}): Roster {
  const named = rules ?? {};
  const set = Object.fromEntries(RULE_NAMES.map((id) => [id, id in named ? { enabled: true, ...(named as Record<string, object>)[id] } : { enabled: false }]));
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
    rules: set,
  });
}

/** Score with both evaluators; they must agree, total and per term. */
export function both(r: Roster, a: RosterAssignment) {
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

export const all = (r: Roster, who: string | null): RosterAssignment => Object.fromEntries(r.seats.map((s) => [s.id, who]));
export const days = (n: number, start: string, end: string, label = 'day', from = 4): ShiftSpec[] =>
  Array.from({ length: n }, (_, i) => {
    const d = String(from + i).padStart(2, '0');
    const endDay = end < start ? String(from + i + 1).padStart(2, '0') : d;
    return [`${label}${i + 1}`, label, `2027-01-${d}T${start}`, `2027-01-${endDay}T${end}`];
  });
