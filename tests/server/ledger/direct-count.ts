import Holidays from 'date-holidays';
import { TZDate } from '@date-fns/tz';
import { format, isSunday, isWeekend, parseISO, subDays } from 'date-fns';

/** Elapsed hours of a local span on a zone's wall clock, by @date-fns/tz (an independent zone implementation). */
export const zoneHours = (a: string, b: string, zone: string) => {
  const at = (s: string) => new TZDate(Number(s.slice(0, 4)), Number(s.slice(5, 7)) - 1, Number(s.slice(8, 10)), Number(s.slice(11, 13)), Number(s.slice(14, 16)), zone).getTime();
  return (at(b) - at(a)) / 3_600_000;
};

/**
 * Night work as Directive 2003/88/EC Art. 2(3)–(4) puts it: a period including 00:00–05:00 (here
 * 23:00–06:00), and a night shift one with at least three hours in it; counted minute by minute.
 */
export const isNightSpan = (start: string, end: string) => {
  const minutes = (s: string) => Date.UTC(Number(s.slice(0, 4)), Number(s.slice(5, 7)) - 1, Number(s.slice(8, 10)), Number(s.slice(11, 13)), Number(s.slice(14, 16))) / 60_000;
  let inNight = 0;
  for (let t = minutes(start); t < minutes(end); t++) {
    const m = ((t % 1440) + 1440) % 1440;
    if (m >= 23 * 60 || m < 6 * 60) inNight++;
  }
  return inNight >= 180;
};

/** Public holidays of a date-holidays region in a year, as ISO dates. */
export const publicHolidays = (country: string, region: string, year: number) =>
  new Holidays(country, region).getHolidays(year).filter((h) => h.type === 'public').map((h) => h.date.slice(0, 10));

export interface StoredPeriod {
  start: string;
  end: string;
  timeZone: string;
  shifts: Array<{ id: number; startsLocal: string; endsLocal: string }>;
  /** The published run's rows: seat → person, and the seat's shift. */
  rows: Array<{ personId: number | null; shiftId: number }>;
  wishes: Array<{ personId: number; date: string | null; shiftId: number | null; kind: string }>;
  holidays: Set<string>;
  contractWeekly: Map<number, number>;
  /** Approved swaps (both people) and approved offers (the taker) of the roster. */
  swapPeople: number[];
}

export type Direct = Record<'shifts' | 'hours' | 'nights' | 'weekendShifts' | 'weekendsWorked' | 'holidayShifts' | 'unpopularShifts' | 'wishesHonoured' | 'wishesRefused' | 'contractHours' | 'swaps', number>;

const zero = (): Direct => ({ shifts: 0, hours: 0, nights: 0, weekendShifts: 0, weekendsWorked: 0, holidayShifts: 0, unpopularShifts: 0, wishesHonoured: 0, wishesRefused: 0, contractHours: 0, swaps: 0 });

/**
 * One whole period's counts per person from the stored rows, written apart from server/ledger:
 * an unpopular shift has more avoid/cannot than prefer wishes on it or its day; a prefer wish is
 * kept when the person works that day, avoid and cannot when they do not.
 */
export function directCounts(p: StoredPeriod): Map<number, Direct> {
  const out = new Map<number, Direct>();
  const of = (id: number) => out.get(id) ?? out.set(id, zero()).get(id)!;
  const day = (s: { startsLocal: string }) => s.startsLocal.slice(0, 10);
  const against = (shift: { id: number; startsLocal: string }) =>
    p.wishes.filter((w) => w.shiftId === shift.id || (w.shiftId === null && w.date === day(shift))).reduce((n, w) => n + (w.kind === 'prefer' ? -1 : 1), 0);
  const weekends = new Map<number, Set<string>>();
  for (const r of p.rows) {
    const shift = p.shifts.find((s) => s.id === r.shiftId)!;
    if (r.personId === null) continue;
    const c = of(r.personId);
    c.shifts++;
    c.hours += zoneHours(shift.startsLocal, shift.endsLocal, p.timeZone);
    if (isNightSpan(shift.startsLocal, shift.endsLocal)) c.nights++;
    if (isWeekend(parseISO(day(shift)))) {
      c.weekendShifts++;
      const date = parseISO(day(shift));
      (weekends.get(r.personId) ?? weekends.set(r.personId, new Set()).get(r.personId)!).add(format(isSunday(date) ? subDays(date, 1) : date, 'yyyy-MM-dd'));
    }
    if (p.holidays.has(day(shift))) c.holidayShifts++;
    if (against(shift) > 0) c.unpopularShifts++;
  }
  for (const w of p.wishes) {
    const hit = p.shifts.filter((s) => (w.shiftId !== null ? s.id === w.shiftId : day(s) === w.date));
    if (!hit.length) continue;
    const works = p.rows.some((r) => r.personId === w.personId && hit.some((s) => s.id === r.shiftId));
    of(w.personId)[(w.kind === 'prefer') === works ? 'wishesHonoured' : 'wishesRefused']++;
  }
  for (const [id, set] of weekends) of(id).weekendsWorked = set.size;
  for (const id of p.swapPeople) of(id).swaps++;
  const days = (Date.parse(p.end) - Date.parse(p.start)) / 86_400_000 + 1;
  for (const [id, c] of out) c.contractHours = ((p.contractWeekly.get(id) ?? 0) * days) / 7;
  return out;
}
