import { addLocalDays, isoWeekday } from '../../shared/roster/time';
import type { AbsenceSettings } from '../../shared/api/absences';

/** The fields that place an absence in time (as stored: local dates inclusive, optional part-day times). */
export interface AbsenceTimes {
  startDate: string;
  endDate: string;
  startTime?: string | null;
  endTime?: string | null;
}

/**
 * The absence as a half-open span of local date-times [start, end), as the roster format has it:
 * a whole day runs from 00:00 to 00:00 of the next day; part days use their times. Strings of the
 * form YYYY-MM-DDTHH:mm compare in time order, so overlap checks are plain string comparisons.
 */
export function absenceSpan(a: AbsenceTimes): { start: string; end: string } {
  return {
    start: `${a.startDate}T${a.startTime ?? '00:00'}`,
    end: a.endTime ? `${a.endDate}T${a.endTime}` : `${addLocalDays(a.endDate, 1)}T00:00`,
  };
}

export const spansOverlap = (a: { start: string; end: string }, b: { start: string; end: string }) => a.start < b.end && b.start < a.end;

/** The period of a roster (local dates, both inclusive) as a span. */
export const periodSpan = (p: { start: string; end: string }) => ({ start: `${p.start}T00:00`, end: `${addLocalDays(p.end, 1)}T00:00` });

const minutesOf = (hhmm: string) => Number(hhmm.slice(0, 2)) * 60 + Number(hhmm.slice(3, 5));

/** Each local day the absence touches, with the hours of that day it covers (24 for a whole day; wall-clock hours). */
export function absentDays(a: AbsenceTimes): Array<{ date: string; hours: number }> {
  const days: Array<{ date: string; hours: number }> = [];
  for (let d = a.startDate; d <= a.endDate; d = addLocalDays(d, 1)) {
    const from = d === a.startDate && a.startTime ? minutesOf(a.startTime) : 0;
    const to = d === a.endDate && a.endTime ? minutesOf(a.endTime) : 24 * 60;
    if (to > from) days.push({ date: d, hours: (to - from) / 60 });
  }
  return days;
}

export type CreditRule = AbsenceSettings['credits'][keyof AbsenceSettings['credits']];

/**
 * Hours one absent day earns under a kind's default: "contracted" is the weekly contracted hours
 * spread over Monday to Friday (÷ 5, nothing on weekends), a number is that many hours for every
 * day absent. Common practice for leave accounting, no source; the settings let a workspace
 * choose otherwise. A part day earns the hours it spans, capped at the day's figure.
 */
function dayCredit(rule: CreditRule, contractedHoursPerWeek: number, day: { date: string; hours: number }): number {
  const daily = rule === 'contracted' ? (isoWeekday(day.date) <= 5 ? contractedHoursPerWeek / 5 : 0) : rule;
  return day.hours >= 24 ? daily : Math.min(day.hours, daily);
}

const round2 = (n: number) => Math.round(n * 100) / 100;

/**
 * Hours an absence credits, optionally only those inside [from, to] (local dates, inclusive).
 * Entered creditHours are the total for the whole absence, so a window gets its share by days
 * (the roster format spreads credit evenly over the days an absence touches, too).
 */
export function creditedHours(
  a: AbsenceTimes & { creditHours?: number | null },
  rule: CreditRule,
  contractedHoursPerWeek: number,
  window?: { from: string; to: string },
): number {
  const days = absentDays(a);
  const inside = window ? days.filter((d) => d.date >= window.from && d.date <= window.to) : days;
  if (a.creditHours !== null && a.creditHours !== undefined) {
    return days.length === 0 ? 0 : round2((a.creditHours * inside.length) / days.length);
  }
  return round2(inside.reduce((sum, d) => sum + dayCredit(rule, contractedHoursPerWeek, d), 0));
}
