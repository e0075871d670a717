/**
 * Local date/time arithmetic for rosters. Local dates and date-times are strings in the
 * period's IANA time zone; instants are epoch milliseconds. Calendar-day arithmetic is
 * done on the date alone (no time zone needed); elapsed time goes through @date-fns/tz so
 * that DST changes count their real length.
 */
import { TZDate } from '@date-fns/tz';
import { addDays, differenceInCalendarDays, format, getISODay } from 'date-fns';

const HOUR = 3_600_000;

export function isValidTimeZone(tz: string): boolean {
  try {
    new Intl.DateTimeFormat('en-GB', { timeZone: tz });
    return true;
  } catch {
    return false;
  }
}

/** "2027-01-04" → its parts, or null if not a calendar date. */
export function parseLocalDate(s: string): { y: number; m: number; d: number } | null {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(s);
  if (!m) return null;
  const y = Number(m[1]);
  const mo = Number(m[2]);
  const d = Number(m[3]);
  const probe = new Date(Date.UTC(y, mo - 1, d));
  if (probe.getUTCFullYear() !== y || probe.getUTCMonth() !== mo - 1 || probe.getUTCDate() !== d) return null;
  return { y, m: mo, d };
}

/** A naive (zone-less) Date for a local date: used only for calendar arithmetic with date-fns. */
function naiveDate(s: string): Date {
  const p = parseLocalDate(s);
  if (!p) throw new Error(`not a date: ${s}`);
  return new Date(p.y, p.m - 1, p.d, 12); // noon keeps the host zone's DST away from the day boundary
}

/** Calendar days from a to b (b − a), both local dates. */
export function daysBetween(a: string, b: string): number {
  return differenceInCalendarDays(naiveDate(b), naiveDate(a));
}

export function addLocalDays(s: string, n: number): string {
  return format(addDays(naiveDate(s), n), 'yyyy-MM-dd');
}

/** ISO weekday 1 = Monday … 7 = Sunday. */
export function isoWeekday(s: string): number {
  return getISODay(naiveDate(s));
}

function parseLocalDateTime(s: string): { y: number; m: number; d: number; h: number; mi: number } {
  const p = parseLocalDate(s.slice(0, 10));
  if (!p) throw new Error(`not a date-time: ${s}`);
  return { ...p, h: Number(s.slice(11, 13)), mi: Number(s.slice(14, 16)) };
}

/**
 * Local date-time in `tz` → instant (ms). A time skipped by a DST change (e.g. 01:30 on
 * the spring-forward night in London) resolves as @date-fns/tz does, to the instant the
 * clock would show after the jump; an ambiguous autumn time (01:30 on the fall-back night) resolves to its later occurrence, as @date-fns/tz does.
 */
export function localDateTimeToInstant(s: string, tz: string): number {
  const t = parseLocalDateTime(s);
  return new TZDate(t.y, t.m - 1, t.d, t.h, t.mi, 0, tz).getTime();
}

/** Instant → local date-time "YYYY-MM-DDTHH:mm" in `tz`. */
export function instantToLocalDateTime(ms: number, tz: string): string {
  return format(new TZDate(ms, tz), "yyyy-MM-dd'T'HH:mm");
}

/** Minutes on a zone-less wall clock (for "is this night time" checks, which are about the clock). */
export function wallMinutes(s: string): number {
  const t = parseLocalDateTime(s);
  return Date.UTC(t.y, t.m - 1, t.d, t.h, t.mi) / 60_000;
}

export function hoursBetween(a: number, b: number): number {
  return (b - a) / HOUR;
}
