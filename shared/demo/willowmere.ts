/**
 * Willowmere House: the invented demo scenario (DESIGN.md, "Demo scenario"). A fictional
 * 40-bed care home with 18 people, three shifts a day and four weeks from Monday 4 Jan 2027
 * (Europe/London). Every name is invented. The setup is feasible with every rule on: the
 * seats need 504 h a week against 533 contracted, three people can lead nights, and
 * tests/shared/demo.test.ts checks a hard-rule-clean roster exists.
 */
import { rosterSchema, type Person, type Roster, type RosterInput, type RuleSet, type ShiftPatternInput, shiftPatternSchema } from '../roster/schema';
import { generateShifts } from '../roster/patterns';
import { addLocalDays } from '../roster/time';

export const WILLOWMERE_SKILLS = [
  { id: 'medication', name: 'Medication round' },
  { id: 'first-aid', name: 'First aid' },
  { id: 'night-lead', name: 'Night lead' },
];

/** Role is for people reading the demo; the model only sees skills. */
export const WILLOWMERE_PEOPLE: { id: string; name: string; role: string; skills: string[]; contractedHoursPerWeek: number }[] = [
  { id: 'imogen', name: 'Imogen Thistlewood', role: 'night lead', skills: ['night-lead', 'medication', 'first-aid'], contractedHoursPerWeek: 36 },
  { id: 'tobias', name: 'Tobias Marchbank', role: 'nurse', skills: ['night-lead', 'medication', 'first-aid'], contractedHoursPerWeek: 37.5 },
  { id: 'delphine', name: 'Delphine Ashcombe', role: 'nurse', skills: ['night-lead', 'medication', 'first-aid'], contractedHoursPerWeek: 30 },
  { id: 'priya', name: 'Priya Hollinshead', role: 'nurse (mentor)', skills: ['medication', 'first-aid'], contractedHoursPerWeek: 37.5 },
  { id: 'owain', name: 'Owain Pemberthy', role: 'nurse', skills: ['medication', 'first-aid'], contractedHoursPerWeek: 30 },
  { id: 'marguerite', name: 'Marguerite Oakleigh', role: 'nurse', skills: ['medication'], contractedHoursPerWeek: 24 },
  { id: 'rosalind', name: 'Rosalind Fairhurst', role: 'care assistant', skills: ['first-aid'], contractedHoursPerWeek: 37.5 },
  { id: 'jasper', name: 'Jasper Kettlewell', role: 'care assistant', skills: [], contractedHoursPerWeek: 37.5 },
  { id: 'hattie', name: 'Hattie Lowther', role: 'care assistant', skills: ['first-aid'], contractedHoursPerWeek: 30 },
  { id: 'niamh', name: 'Niamh Corrigale', role: 'care assistant', skills: [], contractedHoursPerWeek: 24 },
  { id: 'bartholomew', name: 'Bartholomew Quill', role: 'care assistant', skills: ['first-aid'], contractedHoursPerWeek: 37.5 },
  { id: 'saoirse', name: 'Saoirse Penhallow', role: 'care assistant', skills: [], contractedHoursPerWeek: 20 },
  { id: 'felix', name: 'Felix Ambleside', role: 'care assistant', skills: ['first-aid'], contractedHoursPerWeek: 30 },
  { id: 'wilhelmina', name: 'Wilhelmina Crossthwaite', role: 'care assistant', skills: [], contractedHoursPerWeek: 37.5 },
  { id: 'rafael', name: 'Rafael Dunmore', role: 'care assistant', skills: [], contractedHoursPerWeek: 24 },
  { id: 'ottilie', name: 'Ottilie Harrowgate', role: 'care assistant', skills: ['first-aid'], contractedHoursPerWeek: 30 },
  { id: 'ellis', name: 'Ellis Brackenridge', role: 'care assistant (trainee)', skills: [], contractedHoursPerWeek: 30 },
  { id: 'cosima', name: 'Cosima Fenwright', role: 'care assistant', skills: ['first-aid'], contractedHoursPerWeek: 24 },
];

const ALL_DAYS = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'] as const;

/** Early 07–15, late 15–23, night 23–07: 8 h each, so Art. 8's 8 h night holds; 9 seats a day. */
export const WILLOWMERE_PATTERNS: ShiftPatternInput[] = [
  { label: 'early', weekdays: [...ALL_DAYS], start: '07:00', end: '15:00', seats: [{ skill: 'medication', count: 1 }, { skill: 'first-aid', count: 1 }, { skill: null, count: 2 }] },
  { label: 'late', weekdays: [...ALL_DAYS], start: '15:00', end: '23:00', seats: [{ skill: 'medication', count: 1 }, { skill: null, count: 2 }] },
  { label: 'night', weekdays: [...ALL_DAYS], start: '23:00', end: '07:00', seats: [{ skill: 'night-lead', count: 1 }, { skill: null, count: 1 }] },
];

export type WillowmereOverrides = Partial<Omit<RosterInput, 'rules'>> & {
  /** Weeks from the start date (default 4). */
  weeks?: number;
  /** First day (default Monday 2027-01-04). */
  start?: string;
  /** Per-rule overrides merged into the defaults, e.g. { coverage: { hard: true } }. */
  rules?: { [K in keyof RuleSet]?: Partial<RuleSet[K]> };
};

/** The demo roster (validated, defaults filled). Overrides replace top-level fields; rules merge per rule. */
export function makeWillowmereRoster(overrides: WillowmereOverrides = {}): Roster {
  const { weeks = 4, start = '2027-01-04', rules: ruleOverrides = {}, ...rest } = overrides;
  const period = rest.period ?? { start, end: addLocalDays(start, weeks * 7 - 1), timeZone: 'Europe/London' };
  const { shifts, seats } = generateShifts(
    WILLOWMERE_PATTERNS.map((p) => shiftPatternSchema.parse(p)),
    period,
  );
  const d = (n: number) => addLocalDays(period.start, n);
  const inPeriod = (date: string) => date >= period.start && date <= period.end;
  const shiftIds = new Set(shifts.map((s) => s.id));

  // A handful of staff wishes, in days from the start; dropped when a shorter period leaves them out.
  const wishes = [
    { person: 'saoirse', date: d(5), kind: 'cannot' as const, strength: 1 },
    { person: 'saoirse', date: d(6), kind: 'cannot' as const, strength: 1 },
    { person: 'hattie', date: d(14), kind: 'cannot' as const, strength: 1 },
    { person: 'hattie', date: d(15), kind: 'cannot' as const, strength: 1 },
    { person: 'hattie', date: d(16), kind: 'cannot' as const, strength: 1 },
    { person: 'owain', shift: `early-${d(1)}`, kind: 'prefer' as const, strength: 2 },
    { person: 'owain', shift: `early-${d(2)}`, kind: 'prefer' as const, strength: 2 },
    { person: 'owain', shift: `early-${d(3)}`, kind: 'prefer' as const, strength: 2 },
    { person: 'niamh', date: d(11), kind: 'avoid' as const, strength: 4 },
    { person: 'niamh', shift: `night-${d(12)}`, kind: 'avoid' as const, strength: 3 },
    { person: 'tobias', shift: `night-${d(15)}`, kind: 'prefer' as const, strength: 3 },
    { person: 'tobias', shift: `night-${d(16)}`, kind: 'prefer' as const, strength: 3 },
    { person: 'marguerite', date: d(19), kind: 'avoid' as const, strength: 5 },
    { person: 'marguerite', date: d(20), kind: 'avoid' as const, strength: 5 },
    { person: 'wilhelmina', shift: `late-${d(8)}`, kind: 'prefer' as const, strength: 2 },
    { person: 'imogen', date: d(24), kind: 'cannot' as const, strength: 1 },
  ].filter((w) => ('date' in w && w.date ? inPeriod(w.date) : shiftIds.has((w as { shift: string }).shift)));

  // Time away (approved) and per-person terms, in days from the start; credits are the
  // person's contracted daily hours (a five-day week) for each weekday away.
  const at = (n: number) => `${d(n)}T00:00`;
  const absences = [
    // two weeks of annual leave for a nurse: ten weekdays × 24 h / 5
    { person: 'marguerite', kind: 'annual' as const, start: at(14), end: at(28), creditHours: 48 },
    { person: 'jasper', kind: 'sick' as const, start: at(9), end: at(10), creditHours: 7.5 },
    { person: 'felix', kind: 'training' as const, start: at(3), end: at(4), creditHours: 6 },
  ].filter((a) => a.start.slice(0, 10) <= period.end);
  const terms: Record<string, Person['terms']> = {
    // the mentor works days only
    priya: [{ kind: 'noNights', hard: true, weight: 10 }],
    // a part-timer who never works Mondays or Tuesdays
    niamh: [{ kind: 'daysOff', weekdays: ['mon', 'tue'], hard: true, weight: 10 }],
  };

  const baseRules: RosterInput['rules'] = {
    skillMix: { requirements: [{ skill: 'first-aid', min: 1 }] },
  };
  const rules: Record<string, unknown> = { ...baseRules };
  for (const [k, v] of Object.entries(ruleOverrides)) rules[k] = { ...((rules[k] as object) ?? {}), ...v };

  const input: RosterInput = {
    name: 'Willowmere House — four weeks from 4 Jan 2027',
    period,
    skills: WILLOWMERE_SKILLS,
    people: WILLOWMERE_PEOPLE.map(({ role: _role, ...p }) => ({ ...p, terms: terms[p.id] ?? [] })),
    shifts,
    absences,
    seats,
    wishes,
    pairings: [
      // Mentor and trainee: share shifts while Ellis learns the medication round.
      { a: 'priya', b: 'ellis', score: 4 },
      // Two who should not work together.
      { a: 'jasper', b: 'rafael', score: -6 },
    ],
    pins: [],
    rules: rules as RosterInput['rules'],
    ...rest,
  };
  return rosterSchema.parse(input);
}
