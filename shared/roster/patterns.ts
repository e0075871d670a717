/**
 * Shift patterns → dated shifts and seats over a roster period.
 */
import { eachDayOfInterval, format } from 'date-fns';
import type { Period, Seat, Shift, ShiftPattern, Weekday } from './schema';
import { addLocalDays, instantToLocalDateTime, isoWeekday, localDateTimeToInstant, parseLocalDate } from './time';

const WEEKDAY_NUMBER: Record<Weekday, number> = { mon: 1, tue: 2, wed: 3, thu: 4, fri: 5, sat: 6, sun: 7 };

/**
 * Local wall time as it will really be shown: a time skipped by a spring-forward change
 * (01:30 on the last Sunday of March in London) becomes the time the clock shows then (02:30),
 * so stored shifts never name a wall time that does not exist.
 */
function realLocal(dateTime: string, tz: string): string {
  return instantToLocalDateTime(localDateTimeToInstant(dateTime, tz), tz);
}

/**
 * Every shift the patterns define over the period (inclusive), in date then pattern order.
 * A pattern whose end is at or before its start ends the next day (a night). Shift ids are
 * "<label>-<date>" and seat ids "<shift id>-<n>" (n from 1), stable for the same input.
 * Seats keep the pattern's skill order.
 */
export function generateShifts(patterns: readonly ShiftPattern[], period: Period): { shifts: Shift[]; seats: Seat[] } {
  const shifts: Shift[] = [];
  const seats: Seat[] = [];
  const s = parseLocalDate(period.start);
  const e = parseLocalDate(period.end);
  if (!s || !e) throw new Error('period dates must be YYYY-MM-DD');
  const days = eachDayOfInterval({ start: new Date(s.y, s.m - 1, s.d, 12), end: new Date(e.y, e.m - 1, e.d, 12) }).map((d) =>
    format(d, 'yyyy-MM-dd'),
  );
  const labels = new Set<string>();
  for (const p of patterns) {
    if (labels.has(p.label)) throw new Error(`two shift patterns are labelled "${p.label}"`);
    labels.add(p.label);
  }
  for (const date of days) {
    const wd = isoWeekday(date);
    for (const p of patterns) {
      if (!p.weekdays.some((w) => WEEKDAY_NUMBER[w] === wd)) continue;
      const crossesMidnight = p.end <= p.start;
      const start = realLocal(`${date}T${p.start}`, period.timeZone);
      const end = realLocal(`${crossesMidnight ? addLocalDays(date, 1) : date}T${p.end}`, period.timeZone);
      const id = `${p.label}-${date}`;
      shifts.push({ id, patternLabel: p.label, start, end, ...(p.night !== undefined ? { night: p.night } : {}) });
      let n = 0;
      for (const group of p.seats) for (let k = 0; k < group.count; k++) seats.push({ id: `${id}-${++n}`, shift: id, skill: group.skill ?? null });
    }
  }
  return { shifts, seats };
}
