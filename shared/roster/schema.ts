/**
 * The roster JSON format: plain, workspace-independent data that the server stores,
 * the solver compiles and the scorer checks. Documented in docs/roster-format.md;
 * the JSON Schema in docs/roster-format.schema.json is generated from these schemas
 * (shared/roster/write-json-schema.ts).
 *
 * Times: shifts carry LOCAL date-times ("2027-01-04T07:00") in the period's IANA time
 * zone, because that is what a coordinator types and what staff read on the rota; the
 * real elapsed time (for rest gaps and hours) is computed from the time zone, so a night
 * across a DST change counts its true length (shared/roster/time.ts).
 */
import { z } from 'zod';
import { isValidTimeZone, localDateTimeToInstant, parseLocalDate, daysBetween } from './time';

/** Hard caps so that an oversized body is a 4xx naming the field, not a stuck worker. */
export const ROSTER_LIMITS = {
  people: 2000,
  skills: 200,
  shifts: 20_000,
  seats: 60_000,
  wishes: 50_000,
  pairings: 20_000,
  pins: 60_000,
  absences: 20_000,
  periodDays: 366,
} as const;

const id = z.string().min(1).max(80);
const LOCAL_DATE = /^\d{4}-\d{2}-\d{2}$/;
const LOCAL_DATE_TIME = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2})?$/;
const LOCAL_TIME = /^([01]\d|2[0-3]):[0-5]\d$/;

export const localDateSchema = z
  .string()
  .regex(LOCAL_DATE, 'expected a date YYYY-MM-DD')
  .refine((s) => parseLocalDate(s) !== null, 'not a calendar date');
export const localDateTimeSchema = z
  .string()
  .regex(LOCAL_DATE_TIME, 'expected a local date-time YYYY-MM-DDTHH:mm')
  .refine((s) => parseLocalDate(s.slice(0, 10)) !== null && Number(s.slice(11, 13)) < 24 && Number(s.slice(14, 16)) < 60, 'not a valid date-time');
export const localTimeSchema = z.string().regex(LOCAL_TIME, 'expected a time HH:mm');
export const timeZoneSchema = z.string().min(1).max(64).refine(isValidTimeZone, 'unknown IANA time zone');

export const skillSchema = z.object({
  id,
  name: z.string().min(1).max(120),
});

export const weekdaySchema = z.enum(['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun']);

/**
 * Per-person terms: rules for one person beside the roster-wide ones, each hard or soft
 * (soft: `weight` points per unit over, the unit named per kind). `from` = the term covers
 * shifts starting on or after that date (counts are over those shifts); absent = whole period.
 */
const termBase = {
  hard: z.boolean().default(true),
  weight: z.number().min(0).max(10_000).default(10),
  from: localDateSchema.optional(),
};
export const termSchema = z.discriminatedUnion('kind', [
  /** At least `hours` worked (plus credited absence hours) over the covered period. Per hour short. */
  z.object({ kind: z.literal('minHours'), hours: z.number().min(0).max(2000), ...termBase }),
  /** At most `hours` worked (plus credited absence hours) over the covered period. Per hour over. */
  z.object({ kind: z.literal('maxHours'), hours: z.number().min(0).max(2000), ...termBase }),
  /** No night shifts. Per night worked. */
  z.object({ kind: z.literal('noNights'), ...termBase }),
  /** At most `count` night shifts. Per night over. */
  z.object({ kind: z.literal('maxNights'), count: z.number().int().min(0).max(400), ...termBase }),
  /** At most `count` weekends worked (a weekend counts when a shift starts on its Saturday or Sunday). Per weekend over. */
  z.object({ kind: z.literal('maxWeekends'), count: z.number().int().min(0).max(60), ...termBase }),
  /** No shift starting on these weekdays. Per shift. */
  z.object({ kind: z.literal('daysOff'), weekdays: z.array(weekdaySchema).min(1).max(7), ...termBase }),
  /** At most `count` shifts starting in each calendar week (Mon–Sun). Per shift over. */
  z.object({ kind: z.literal('maxShiftsPerWeek'), count: z.number().int().min(0).max(21), ...termBase }),
  /** No shift starting before this local time of day. Per shift. */
  z.object({ kind: z.literal('earliestStart'), time: localTimeSchema, ...termBase }),
  /** Every shift ends on its start day at or before this local time (a shift past midnight breaks it). Per shift. */
  z.object({ kind: z.literal('latestEnd'), time: localTimeSchema, ...termBase }),
  /** Only shifts whose pattern label is listed. Per shift outside. */
  z.object({ kind: z.literal('allowedPatterns'), labels: z.array(z.string().min(1).max(60)).min(1).max(50), ...termBase }),
]);
export const TERM_KINDS = ['minHours', 'maxHours', 'noNights', 'maxNights', 'maxWeekends', 'daysOff', 'maxShiftsPerWeek', 'earliestStart', 'latestEnd', 'allowedPatterns'] as const;

export const personSchema = z.object({
  id,
  name: z.string().min(1).max(120),
  skills: z.array(id).max(200).default([]),
  /** Contracted hours per week; absent = no target (bank/relief staff). */
  contractedHoursPerWeek: z.number().min(0).max(168).optional(),
  terms: z.array(termSchema).max(50).default([]),
});

export const absenceKindSchema = z.enum(['annual', 'sick', 'training', 'parental', 'other']);
/**
 * Approved time away. The person is unavailable (hard) for every shift whose time span
 * overlaps [start, end). `creditHours` count toward contracted hours and the hours rules
 * (Art. 16(b): leave is neutral in the average), spread evenly over the local days the
 * absence touches inside the period.
 */
export const absenceSchema = z.object({
  person: id,
  kind: absenceKindSchema.default('other'),
  /** Local date-time; a whole day starts at 00:00. */
  start: localDateTimeSchema,
  /** Local date-time, exclusive; a whole day ends at 00:00 of the next day. */
  end: localDateTimeSchema,
  creditHours: z.number().min(0).max(5000).default(0),
});

export const periodSchema = z.object({
  /** First day of the roster (local date, inclusive). */
  start: localDateSchema,
  /** Last day of the roster (local date, inclusive). */
  end: localDateSchema,
  timeZone: timeZoneSchema,
});

export const shiftSchema = z.object({
  id,
  /** The pattern the shift came from, e.g. early / late / night; free text. */
  patternLabel: z.string().min(1).max(60),
  /** Local date-time in the period's time zone; the shift belongs to the day it starts on. */
  start: localDateTimeSchema,
  /** Local date-time; must be after start (a night ends on the next day). */
  end: localDateTimeSchema,
  /** Night shift? Absent = derived: at least 3 h inside 23:00–06:00 local (see docs). */
  night: z.boolean().optional(),
});

export const seatSchema = z.object({
  id,
  shift: id,
  /** Skill the person in this seat must have; null = anyone. */
  skill: id.nullable().default(null),
});

export const wishKindSchema = z.enum(['prefer', 'avoid', 'cannot']);
export const wishSchema = z
  .object({
    person: id,
    /** Exactly one of date or shift. A date wish applies to every shift starting that day. */
    date: localDateSchema.optional(),
    shift: id.optional(),
    kind: wishKindSchema,
    /** Points gained (prefer) or lost (avoid) per shift; ignored for cannot (hard). */
    strength: z.number().min(0).max(1000).default(1),
  });

export const pairingSchema = z.object({
  a: id,
  b: id,
  /** Points each time both work the same shift: positive = together, negative = apart. */
  score: z.number().min(-1000).max(1000).default(0),
  /** Hard: never on the same shift. */
  never: z.boolean().default(false),
});

export const pinSchema = z.object({
  seat: id,
  /** The person fixed in the seat; null pins the seat open. */
  person: id.nullable(),
});

/**
 * Every rule: on/off, hard (an assignment breaking it is impossible) or soft (each
 * violation unit costs `weight` points; the unit is named per rule below).
 */
function rule<T extends z.ZodRawShape>(defaults: { hard: boolean; weight: number; enabled?: boolean }, extra: T) {
  return z
    .object({
      enabled: z.boolean().default(defaults.enabled ?? true),
      hard: z.boolean().default(defaults.hard),
      weight: z.number().min(0).max(10_000).default(defaults.weight),
      ...extra,
    })
    .prefault({} as never); // every field has a default; the generic T hides that from the type checker
}

const skillMixRequirementSchema = z.object({
  skill: id,
  min: z.number().int().min(1).max(100),
  /** Only shifts with this pattern label; absent = every shift. */
  patternLabel: z.string().min(1).max(60).optional(),
});

/**
 * Defaults: EU Directive 2003/88/EC as a baseline where it has an article; the rest is
 * common practice with no source. Local law and agreements decide; Rotaloom checks what it is told.
 */
export const ruleSetSchema = z.object({
  /** Open-seat penalty, per open seat (coverage). Hard = no seat may stay open. Common practice. */
  coverage: rule({ hard: false, weight: 100 }, {}),
  /** Minimum rest from the end of one shift to the start of a later one (Art. 3: 11 h). Per short gap. */
  minRest: rule({ hard: true, weight: 20 }, { hours: z.number().min(0).max(48).default(11) }),
  /**
   * Weekly rest (Art. 5 with Art. 16(a)): in every window of `days` consecutive days (7; Art.
   * 16(a) allows a reference period up to 14), an uninterrupted rest of at least `hours` (35 =
   * 24 h plus the 11 h daily rest), measured in real time inside the window. Per window without it.
   * `days` up to 28 still parses so rule sets stored before this rule changed stay valid.
   */
  weeklyRest: rule({ hard: true, weight: 20 }, { days: z.number().int().min(2).max(28).default(7), hours: z.number().min(1).max(168).default(35) }),
  /**
   * Average weekly working time (Art. 6 with Art. 16(b)): hours worked plus credited absence
   * hours over a reference period of `referenceDays` (absent = the roster period, at most 123
   * days ≈ 4 months; shorter than the period = every window of that length) at most
   * `hours` × days / 7 (a window shorter than a week is held to one week's `hours`). Per hour over.
   */
  averageWeeklyHours: rule({ hard: true, weight: 5 }, { hours: z.number().min(1).max(168).default(48), referenceDays: z.number().int().min(1).max(123).optional() }),
  /**
   * Night work (Art. 8): a night worker (anyone who can take a night seat, see docs) works at
   * most `hours` on average per 24 h over `referenceDays` (absent = the roster period), the
   * weekly rest days left out of the average. Per hour over.
   */
  nightAverage: rule({ hard: true, weight: 5 }, { hours: z.number().min(1).max(24).default(8), referenceDays: z.number().int().min(1).max(366).optional() }),
  /** Local policy, no source (was weeklyRest before it checked real rest): in every `days` consecutive days at most `maxShifts` shifts start. Per shift over. Off by default. */
  shiftsPerWindow: rule({ hard: true, weight: 20, enabled: false }, { days: z.number().int().min(2).max(28).default(7), maxShifts: z.number().int().min(1).max(56).default(6) }),
  /** Local policy, stricter than Art. 6: hours of shifts starting in any 7 consecutive days, plus credited absence hours. Per hour over. Off by default. */
  maxHoursPer7Days: rule({ hard: true, weight: 5, enabled: false }, { hours: z.number().min(1).max(168).default(48) }),
  /** A night shift longer than `hours` (Art. 8: 8 h) costs `weight` per person working it. */
  nightShiftLength: rule({ hard: false, weight: 5 }, { hours: z.number().min(1).max(24).default(8) }),
  /** Common practice, no source: at most `days` consecutive days with a shift start. Per shift over. */
  maxConsecutiveDays: rule({ hard: false, weight: 5 }, { days: z.number().int().min(1).max(27).default(5) }),
  /** Common practice, no source: at most `nights` night shifts on consecutive days. Per night over. */
  maxNightsInRow: rule({ hard: false, weight: 5 }, { nights: z.number().int().min(1).max(27).default(4) }),
  /** Common practice: hours worked near contracted hours/week × days/7. Per hour outside ± toleranceHours. */
  contractedHours: rule({ hard: false, weight: 0.5 }, { toleranceHours: z.number().min(0).max(500).default(8) }),
  /** Common practice: nobody works more night shifts than their fair share, rounded up. Per night over. */
  fairNights: rule({ hard: false, weight: 3 }, {}),
  /** Common practice: the same for shifts starting on a Saturday or Sunday. Per weekend shift over. */
  fairWeekends: rule({ hard: false, weight: 3 }, {}),
  /** Common practice: at least `min` people with `skill` on each (matching) shift. Per person short. */
  skillMix: rule({ hard: false, weight: 10 }, { requirements: z.array(skillMixRequirementSchema).max(50).default([]) }),
});

/** Shift pattern: a recurring shift definition that generates shifts over the period. */
export const shiftPatternSchema = z.object({
  label: z.string().min(1).max(60),
  weekdays: z.array(weekdaySchema).min(1).max(7),
  /** Local start time HH:mm. */
  start: localTimeSchema,
  /** Local end time HH:mm; at or before start means the shift ends the next day. */
  end: localTimeSchema,
  seats: z.array(z.object({ skill: id.nullable().default(null), count: z.number().int().min(1).max(100) })).min(1).max(50),
  night: z.boolean().optional(),
});

const rosterBaseSchema = z.object({
  format: z.literal('rotaloom.roster/1').default('rotaloom.roster/1'),
  name: z.string().max(200).optional(),
  period: periodSchema,
  skills: z.array(skillSchema).max(ROSTER_LIMITS.skills),
  people: z.array(personSchema).max(ROSTER_LIMITS.people),
  shifts: z.array(shiftSchema).max(ROSTER_LIMITS.shifts),
  seats: z.array(seatSchema).max(ROSTER_LIMITS.seats),
  wishes: z.array(wishSchema).max(ROSTER_LIMITS.wishes).default([]),
  pairings: z.array(pairingSchema).max(ROSTER_LIMITS.pairings).default([]),
  pins: z.array(pinSchema).max(ROSTER_LIMITS.pins).default([]),
  absences: z.array(absenceSchema).max(ROSTER_LIMITS.absences).default([]),
  rules: ruleSetSchema.prefault({}),
});

type Ctx = z.core.$RefinementCtx<z.output<typeof rosterBaseSchema>>;

function duplicates(ctx: Ctx, items: { id: string }[], field: string): Map<string, number> {
  const index = new Map<string, number>();
  items.forEach((item, i) => {
    if (index.has(item.id)) ctx.addIssue({ code: 'custom', path: [field, i, 'id'], message: `duplicate id "${item.id}"` });
    else index.set(item.id, i);
  });
  return index;
}

/** Cross-reference checks: every error names the path of the offending field. */
function checkReferences(r: z.output<typeof rosterBaseSchema>, ctx: Ctx): void {
  const add = (path: (string | number)[], message: string) => ctx.addIssue({ code: 'custom', path, message });

  const startDate = parseLocalDate(r.period.start);
  const endDate = parseLocalDate(r.period.end);
  if (startDate && endDate) {
    const days = daysBetween(r.period.start, r.period.end) + 1;
    if (days < 1) add(['period', 'end'], 'period ends before it starts');
    else if (days > ROSTER_LIMITS.periodDays) add(['period', 'end'], `period is ${days} days; at most ${ROSTER_LIMITS.periodDays}`);
  }
  const tzOk = isValidTimeZone(r.period.timeZone);

  const skills = duplicates(ctx, r.skills, 'skills');
  const people = duplicates(ctx, r.people, 'people');
  const shifts = duplicates(ctx, r.shifts, 'shifts');
  const seats = duplicates(ctx, r.seats, 'seats');

  r.people.forEach((p, i) =>
    p.skills.forEach((s, j) => {
      if (!skills.has(s)) add(['people', i, 'skills', j], `unknown skill "${s}"`);
    }),
  );

  r.shifts.forEach((s, i) => {
    if (!tzOk) return;
    const a = localDateTimeToInstant(s.start, r.period.timeZone);
    const b = localDateTimeToInstant(s.end, r.period.timeZone);
    if (b <= a) add(['shifts', i, 'end'], `shift "${s.id}" ends (${s.end}) before or when it starts (${s.start})`);
    else if (b - a > 24 * 3600_000) add(['shifts', i, 'end'], `shift "${s.id}" is longer than 24 h`);
    const day = s.start.slice(0, 10);
    if (day < r.period.start || day > r.period.end) add(['shifts', i, 'start'], `shift "${s.id}" starts outside the period ${r.period.start}–${r.period.end}`);
  });

  const skillHolders = new Map<string, number>();
  for (const p of r.people) for (const s of new Set(p.skills)) skillHolders.set(s, (skillHolders.get(s) ?? 0) + 1);
  r.seats.forEach((s, i) => {
    if (!shifts.has(s.shift)) add(['seats', i, 'shift'], `unknown shift "${s.shift}"`);
    if (s.skill !== null) {
      if (!skills.has(s.skill)) add(['seats', i, 'skill'], `unknown skill "${s.skill}"`);
      else if (!skillHolders.has(s.skill)) add(['seats', i, 'skill'], `seat "${s.id}" needs skill "${s.skill}" and nobody has it`);
    }
  });

  r.wishes.forEach((w, i) => {
    if (!people.has(w.person)) add(['wishes', i, 'person'], `unknown person "${w.person}"`);
    if ((w.date === undefined) === (w.shift === undefined)) add(['wishes', i], 'a wish names exactly one of date or shift');
    if (w.shift !== undefined && !shifts.has(w.shift)) add(['wishes', i, 'shift'], `unknown shift "${w.shift}"`);
    if (w.date !== undefined && (w.date < r.period.start || w.date > r.period.end)) add(['wishes', i, 'date'], `date ${w.date} is outside the period`);
  });

  const pairs = new Set<string>();
  r.pairings.forEach((p, i) => {
    if (!people.has(p.a)) add(['pairings', i, 'a'], `unknown person "${p.a}"`);
    if (!people.has(p.b)) add(['pairings', i, 'b'], `unknown person "${p.b}"`);
    if (p.a === p.b) add(['pairings', i, 'b'], `a pairing of "${p.a}" with themself`);
    const key = p.a < p.b ? `${p.a}\u0000${p.b}` : `${p.b}\u0000${p.a}`;
    if (pairs.has(key)) add(['pairings', i], `duplicate pairing of "${p.a}" and "${p.b}"`);
    pairs.add(key);
  });

  const pinned = new Set<string>();
  r.pins.forEach((p, i) => {
    const si = seats.get(p.seat);
    if (si === undefined) add(['pins', i, 'seat'], `unknown seat "${p.seat}"`);
    if (pinned.has(p.seat)) add(['pins', i, 'seat'], `seat "${p.seat}" is pinned twice`);
    pinned.add(p.seat);
    if (p.person !== null) {
      const pi = people.get(p.person);
      if (pi === undefined) add(['pins', i, 'person'], `unknown person "${p.person}"`);
      else if (si !== undefined) {
        const need = r.seats[si].skill;
        if (need !== null && !r.people[pi].skills.includes(need)) add(['pins', i, 'person'], `"${r.people[pi].name}" lacks skill "${need}" needed by seat "${p.seat}"`);
      }
    }
  });

  const absencesOf = new Map<string, { start: string; end: string; i: number }[]>();
  r.absences.forEach((a, i) => {
    if (!people.has(a.person)) add(['absences', i, 'person'], `unknown person "${a.person}"`);
    if (a.end <= a.start) add(['absences', i, 'end'], `absence ends (${a.end}) before or when it starts (${a.start})`);
    const mine = absencesOf.get(a.person) ?? [];
    const clash = mine.find((b) => a.start < b.end && b.start < a.end);
    if (clash) add(['absences', i, 'start'], `absence overlaps absences[${clash.i}] of the same person`);
    mine.push({ start: a.start, end: a.end, i });
    absencesOf.set(a.person, mine);
  });

  r.rules.skillMix.requirements.forEach((q, i) => {
    if (!skills.has(q.skill)) add(['rules', 'skillMix', 'requirements', i, 'skill'], `unknown skill "${q.skill}"`);
  });
}

export const rosterSchema = rosterBaseSchema.superRefine(checkReferences);

/** Roster as written in a file or request body (defaults may be left out). */
export type RosterInput = z.input<typeof rosterSchema>;
/** Roster after validation: every default filled in. */
export type Roster = z.output<typeof rosterSchema>;
export type Person = z.output<typeof personSchema>;
export type Skill = z.output<typeof skillSchema>;
export type Period = z.output<typeof periodSchema>;
export type Shift = z.output<typeof shiftSchema>;
export type Seat = z.output<typeof seatSchema>;
export type Wish = z.output<typeof wishSchema>;
export type WishKind = z.output<typeof wishKindSchema>;
export type Pairing = z.output<typeof pairingSchema>;
export type Pin = z.output<typeof pinSchema>;
export type Absence = z.output<typeof absenceSchema>;
export type AbsenceKind = z.output<typeof absenceKindSchema>;
export type Term = z.output<typeof termSchema>;
export type TermKind = Term['kind'];
export type RuleSet = z.output<typeof ruleSetSchema>;
export type RuleName = keyof RuleSet;
export type ShiftPattern = z.output<typeof shiftPatternSchema>;
export type ShiftPatternInput = z.input<typeof shiftPatternSchema>;
export type Weekday = z.output<typeof weekdaySchema>;

/**
 * A filled roster: seat id → person id, null (or absent) = open. The form the server
 * stores and `scoreRoster` / `decodeAssignment` speak.
 */
export const rosterAssignmentSchema = z.record(id, id.nullable());
export type RosterAssignment = z.output<typeof rosterAssignmentSchema>;

export const RULE_NAMES: readonly RuleName[] = [
  'coverage',
  'minRest',
  'weeklyRest',
  'averageWeeklyHours',
  'nightAverage',
  'shiftsPerWindow',
  'maxHoursPer7Days',
  'nightShiftLength',
  'maxConsecutiveDays',
  'maxNightsInRow',
  'contractedHours',
  'fairNights',
  'fairWeekends',
  'skillMix',
];

export type ValidationIssue = { path: string; message: string };
export type ParseRosterResult = { ok: true; roster: Roster } | { ok: false; issues: ValidationIssue[] };

/** Dotted path for an error message, e.g. "pairings[2].b". */
export function formatPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const p of path) out += typeof p === 'number' ? `[${p}]` : out ? `.${String(p)}` : String(p);
  return out || '(root)';
}

/** Validate unknown JSON; issues name the field path (the server returns them as a 4xx). */
export function parseRoster(input: unknown): ParseRosterResult {
  const r = rosterSchema.safeParse(input);
  if (r.success) return { ok: true, roster: r.data };
  return { ok: false, issues: r.error.issues.map((i) => ({ path: formatPath(i.path), message: i.message })) };
}
