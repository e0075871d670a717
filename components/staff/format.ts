import { TZDate } from '@date-fns/tz';
import { format, parseISO } from 'date-fns';

/** A UTC instant as the wall clock of the workspace's time zone. */
export const inZone = (iso: string, timeZone: string) => new TZDate(new Date(iso).getTime(), timeZone);

export const dayLabel = (iso: string, timeZone: string) => format(inZone(iso, timeZone), 'EEE d MMM');
export const longDayLabel = (iso: string, timeZone: string) => format(inZone(iso, timeZone), 'EEEE d MMMM');
export const timeLabel = (iso: string, timeZone: string) => format(inZone(iso, timeZone), 'HH:mm');
export const localDateOf = (iso: string, timeZone: string) => format(inZone(iso, timeZone), 'yyyy-MM-dd');

/** "2027-01-04" → "Mon 4 Jan" without any time zone (a calendar day is a calendar day). */
export const plainDay = (date: string) => format(parseISO(date), 'EEE d MMM');
export const plainLongDay = (date: string) => format(parseISO(date), 'EEEE d MMMM');

export const hoursLabel = (h: number) => `${Number.isInteger(h) ? h : h.toFixed(1)} h`;

/** Whole dates from a to b inclusive, as YYYY-MM-DD (calendar arithmetic at noon UTC, so no DST edge). */
export function datesBetween(a: string, b: string): string[] {
  const out: string[] = [];
  const end = Date.parse(`${b}T12:00:00Z`);
  for (let t = Date.parse(`${a}T12:00:00Z`); t <= end; t += 86_400_000) out.push(new Date(t).toISOString().slice(0, 10));
  return out;
}

export const isoWeekday = (date: string) => ((new Date(`${date}T12:00:00Z`).getUTCDay() + 6) % 7) + 1;
