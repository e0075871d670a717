/**
 * Facts derived from a validated roster that both the compiler (solver/roster/compile.ts)
 * and the independent scorer (solver/roster/score-roster.ts) need: real shift times,
 * night/weekend flags, rolling windows and fair shares. They are definitions of the
 * format (documented in docs/roster-format.md), not rule evaluation, so sharing them does
 * not weaken the scorer's independence from the model.
 */
import { format } from 'date-fns';
import type { Absence, Person, Roster, Shift } from './schema';
import { addLocalDays, daysBetween, isoWeekday, localDateTimeToInstant, parseLocalDate, wallMinutes } from './time';

export type ShiftFacts = {
  index: number;
  id: string;
  patternLabel: string;
  startMs: number;
  endMs: number;
  /** Real elapsed minutes, an integer (a night across a DST change is 7 or 9 h on the wall clock's 8). */
  minutes: number;
  /** minutes / 60. Rules sum minutes (integers) and divide once, so every evaluator gets the same floats. */
  hours: number;
  /** Local date the shift starts on; the shift counts for that day. */
  date: string;
  /** Days from the period's first day to `date`. */
  day: number;
  night: boolean;
  weekend: boolean;
};

/** Night time 23:00–06:00 local: 7 h including 00:00–05:00 as Art. 2(3) requires (value from memory of national defaults). */
export const NIGHT_WINDOW = { startMinute: 23 * 60, endMinute: 6 * 60 } as const;
/** A shift is a night shift when at least 3 h of it fall in night time (Art. 2(4)(a), night worker's "three hours"). */
export const NIGHT_MIN_MINUTES = 180;

/** Derived night flag: wall-clock overlap of the shift with 23:00–06:00 windows. */
export function isNightShift(shift: Pick<Shift, 'start' | 'end' | 'night'>): boolean {
  if (shift.night !== undefined) return shift.night;
  const a = wallMinutes(shift.start);
  const b = wallMinutes(shift.end);
  const dayMin = 24 * 60;
  let overlap = 0;
  // Night windows start at 23:00 of the day before the shift's first day through its last day.
  for (let d = Math.floor(a / dayMin) - 1; d * dayMin <= b; d++) {
    const ws = d * dayMin + NIGHT_WINDOW.startMinute;
    const we = (d + 1) * dayMin + NIGHT_WINDOW.endMinute;
    overlap += Math.max(0, Math.min(b, we) - Math.max(a, ws));
  }
  return overlap >= NIGHT_MIN_MINUTES;
}

export function periodDays(roster: Pick<Roster, 'period'>): number {
  return daysBetween(roster.period.start, roster.period.end) + 1;
}

export function shiftFacts(roster: Pick<Roster, 'period' | 'shifts'>): ShiftFacts[] {
  const tz = roster.period.timeZone;
  return roster.shifts.map((s, index) => {
    const startMs = localDateTimeToInstant(s.start, tz);
    const endMs = localDateTimeToInstant(s.end, tz);
    const date = s.start.slice(0, 10);
    const wd = isoWeekday(date);
    return {
      index,
      id: s.id,
      patternLabel: s.patternLabel,
      startMs,
      endMs,
      minutes: Math.round((endMs - startMs) / 60_000),
      hours: Math.round((endMs - startMs) / 60_000) / 60,
      date,
      day: daysBetween(roster.period.start, date),
      night: isNightShift(s),
      weekend: wd === 6 || wd === 7,
    };
  });
}

/**
 * Rolling windows of `length` days, each wholly inside the period: [first, last] day
 * indices. A period shorter than the window is one window (the whole period).
 */
export function rollingWindows(totalDays: number, length: number): { first: number; last: number }[] {
  if (totalDays <= length) return [{ first: 0, last: totalDays - 1 }];
  const out: { first: number; last: number }[] = [];
  for (let d = 0; d + length <= totalDays; d++) out.push({ first: d, last: d + length - 1 });
  return out;
}

/** Contracted hours over the period: hours/week × days/7; undefined when the person has no contract. */
export function contractedTarget(person: Person, totalDays: number): number | undefined {
  return person.contractedHoursPerWeek === undefined ? undefined : (person.contractedHoursPerWeek * totalDays) / 7;
}

/** Saturday's local date of the weekend a Saturday or Sunday belongs to (its key when weekends are counted, not weekend shifts). */
export const weekendOf = (date: string) => (isoWeekday(date) === 7 ? addLocalDays(date, -1) : date);

/**
 * Fair share of a kind of shift (nights or weekends) per person: each such seat is split
 * among the people who could take it by skill, in proportion to contracted hours (people
 * without a contract weigh as the mean contract, or 1 if nobody has one); a person's share
 * is the sum of their parts, rounded up. Splitting seat by seat keeps the share honest when
 * only a few people hold a skill (three night leads share the night-lead seats between them).
 * Returns person index → share; people who could take none are absent.
 */
export function fairShares(roster: Roster, facts: ShiftFacts[], pick: (f: ShiftFacts) => boolean): Map<number, number> {
  const shiftIndex = new Map(roster.shifts.map((s, i) => [s.id, i]));
  const contracts = roster.people.map((p) => p.contractedHoursPerWeek).filter((c): c is number => c !== undefined);
  const mean = contracts.length ? contracts.reduce((a, b) => a + b, 0) / contracts.length : 1;
  const weight = roster.people.map((p) => p.contractedHoursPerWeek ?? mean);
  // seats of the kind, counted by required skill (null = anyone)
  const bySkill = new Map<string | null, number>();
  for (const seat of roster.seats) if (pick(facts[shiftIndex.get(seat.shift)!])) bySkill.set(seat.skill, (bySkill.get(seat.skill) ?? 0) + 1);
  const share = new Map<number, number>();
  for (const [skill, count] of bySkill) {
    const holders = roster.people.map((_, i) => i).filter((i) => skill === null || roster.people[i].skills.includes(skill));
    const total = holders.reduce((m, i) => m + weight[i], 0);
    for (const i of holders) share.set(i, (share.get(i) ?? 0) + (total > 0 ? (count * weight[i]) / total : count / holders.length));
  }
  const out = new Map<number, number>();
  // tiny epsilon so that 3.0000000001 from float division is not rounded up to 4
  for (const [i, v] of share) out.set(i, Math.ceil(v - 1e-9));
  return out;
}

/** "Mon 4 Jan" for a local date. */
export function formatDay(date: string): string {
  const p = parseLocalDate(date)!;
  return format(new Date(p.y, p.m - 1, p.d, 12), 'EEE d MMM');
}

/** "the late shift on Mon 4 Jan". */
export function describeShift(f: Pick<ShiftFacts, 'patternLabel' | 'date'>): string {
  return `the ${f.patternLabel} shift on ${formatDay(f.date)}`;
}

/** Hours as people say them: "9 h", "7.5 h". */
export function formatHours(h: number): string {
  const r = Math.round(h * 100) / 100;
  return `${r} h`;
}

/** Instant at 00:00 local of the period's day `day` (0 = first day; `periodDays` = the end of the last). */
export function dayStartMs(roster: Pick<Roster, 'period'>, day: number): number {
  return localDateTimeToInstant(`${addLocalDays(roster.period.start, day)}T00:00`, roster.period.timeZone);
}

/**
 * Person index → the shifts an absence makes them unavailable for (any overlap of the shift's
 * real span with [start, end)), each with the absence that blocks it.
 */
export function absenceBlocks(roster: Roster, facts: ShiftFacts[]): Map<number, Map<number, Absence>> {
  const personIdx = new Map(roster.people.map((p, i) => [p.id, i]));
  const out = new Map<number, Map<number, Absence>>();
  for (const a of roster.absences) {
    const p = personIdx.get(a.person);
    if (p === undefined) continue;
    const s = localDateTimeToInstant(a.start, roster.period.timeZone);
    const e = localDateTimeToInstant(a.end, roster.period.timeZone);
    for (const f of facts)
      if (f.startMs < e && s < f.endMs) {
        if (!out.has(p)) out.set(p, new Map());
        out.get(p)!.set(f.index, a);
      }
  }
  return out;
}

/**
 * Credited absence hours per person and period day: each absence's creditHours spread evenly
 * over every local day it touches (a day it covers any minute of, end exclusive); the days that
 * fall inside the period carry their part. Hours rules add the sum over their days, summed in
 * day order (creditHoursIn), so the compiler and the scorer get the same floats.
 */
export function absenceCredits(roster: Roster): Float64Array[] {
  const days = periodDays(roster);
  const personIdx = new Map(roster.people.map((p, i) => [p.id, i]));
  const out = roster.people.map(() => new Float64Array(days));
  for (const a of roster.absences) {
    const p = personIdx.get(a.person);
    if (p === undefined || a.creditHours === 0) continue;
    const firstDate = a.start.slice(0, 10);
    // an end at 00:00 does not touch its day
    const lastDate = /T00:00(:00)?$/.test(a.end) ? addLocalDays(a.end.slice(0, 10), -1) : a.end.slice(0, 10);
    const touched = daysBetween(firstDate, lastDate) + 1;
    if (touched < 1) continue;
    const perDay = a.creditHours / touched;
    for (let k = 0; k < touched; k++) {
      const d = daysBetween(roster.period.start, firstDate) + k;
      if (d >= 0 && d < days) out[p][d] += perDay;
    }
  }
  return out;
}

/** Credited hours of person p on days first..last (inclusive), summed in day order. */
export function creditHoursIn(credits: Float64Array[], p: number, first: number, last: number): number {
  let t = 0;
  const row = credits[p];
  for (let d = Math.max(0, first); d <= last && d < row.length; d++) t += row[d];
  return t;
}

/** Day index (from the period start) of a local date, which may lie outside the period. */
export function dayIndex(roster: Pick<Roster, 'period'>, date: string): number {
  return daysBetween(roster.period.start, date);
}
