import { isNightShift, weekendOf } from '../../shared/roster/derive';
import { daysBetween, isoWeekday, localDateTimeToInstant } from '../../shared/roster/time';
import type { LedgerCounts } from '../../shared/api/ledger';

export const zeroCounts = (): LedgerCounts => ({ shifts: 0, hours: 0, nights: 0, weekendShifts: 0, weekendsWorked: 0, holidayShifts: 0, unpopularShifts: 0, wishesHonoured: 0, wishesRefused: 0, contractHours: 0, swaps: 0 });

const COUNT_KEYS = Object.keys(zeroCounts()) as Array<keyof LedgerCounts>;

/** Adds the counts only: `into` may carry other keys (a period's rosterId), which stay as they are. */
export function addCounts(into: LedgerCounts, more: LedgerCounts): LedgerCounts {
  for (const k of COUNT_KEYS) into[k] = Math.round((into[k] + more[k]) * 100) / 100;
  return into;
}

/** Each count over `n` (a per-person average), to the hundredth as sums are kept. */
export function dividedCounts(c: LedgerCounts, n: number): LedgerCounts {
  const out = zeroCounts();
  for (const k of COUNT_KEYS) out[k] = Math.round((c[k] / n) * 100) / 100;
  return out;
}

export interface PeriodData {
  timeZone: string;
  /** The period clipped to the ledger's range. */
  start: string;
  end: string;
  shifts: Array<{ id: number; startsLocal: string; endsLocal: string; night: boolean | null }>;
  /** shift id → people working it (the published run). */
  workers: Map<number, number[]>;
  wishes: Array<{ personId: number; shiftId: number | null; date: string | null; kind: 'prefer' | 'avoid' | 'cannot' }>;
  contracts: Map<number, number>;
  holidays: Set<string>;
}

/**
 * One published period's counts per person, straight from who works what:
 * - a night is a shift with 3 h or more in 23:00–06:00 (shared/roster/derive isNightShift, unless the shift says);
 * - a weekend shift starts on a Saturday or Sunday, a holiday shift on a public holiday, on its roster's wall clock;
 *   weekends worked are the distinct weekends of someone's weekend shifts;
 * - an unpopular shift is one more of the team wished to avoid (avoid or cannot) than to work (prefer);
 * - a prefer wish is honoured when the person works that shift (or any shift that day), avoid and
 *   cannot when they do not; the others are refused;
 * - contract hours are the weekly contract over the period's days in range (days / 7).
 */
export function countPeriod(p: PeriodData): Map<number, LedgerCounts> {
  const out = new Map<number, LedgerCounts>();
  const of = (person: number) => out.get(person) ?? out.set(person, zeroCounts()).get(person)!;
  const inRange = p.shifts.filter((s) => s.startsLocal.slice(0, 10) >= p.start && s.startsLocal.slice(0, 10) <= p.end);
  const dateOf = new Map(inRange.map((s) => [s.id, s.startsLocal.slice(0, 10)]));
  const weekends = new Map<number, Set<string>>();
  const stance = new Map<number, number>();
  for (const w of p.wishes) {
    const hits = w.shiftId !== null ? [w.shiftId] : inRange.filter((s) => dateOf.get(s.id) === w.date).map((s) => s.id);
    for (const id of hits) stance.set(id, (stance.get(id) ?? 0) + (w.kind === 'prefer' ? -1 : 1));
  }
  for (const s of inRange) {
    const date = dateOf.get(s.id)!;
    const hours = (localDateTimeToInstant(s.endsLocal, p.timeZone) - localDateTimeToInstant(s.startsLocal, p.timeZone)) / 3_600_000;
    const night = isNightShift({ start: s.startsLocal, end: s.endsLocal, night: s.night ?? undefined });
    for (const person of p.workers.get(s.id) ?? []) {
      const c = of(person);
      c.shifts += 1;
      c.hours += hours;
      if (night) c.nights += 1;
      if (isoWeekday(date) >= 6) {
        c.weekendShifts += 1;
        (weekends.get(person) ?? weekends.set(person, new Set()).get(person)!).add(weekendOf(date));
      }
      if (p.holidays.has(date)) c.holidayShifts += 1;
      if ((stance.get(s.id) ?? 0) > 0) c.unpopularShifts += 1;
    }
  }
  for (const [person, set] of weekends) of(person).weekendsWorked = set.size;
  const works = (person: number, shiftId: number) => (p.workers.get(shiftId) ?? []).includes(person);
  for (const w of p.wishes) {
    const shifts = w.shiftId !== null ? (dateOf.has(w.shiftId) ? [w.shiftId] : []) : inRange.filter((s) => dateOf.get(s.id) === w.date).map((s) => s.id);
    if (shifts.length === 0) continue;
    const working = shifts.some((id) => works(w.personId, id));
    const honoured = w.kind === 'prefer' ? working : !working;
    of(w.personId)[honoured ? 'wishesHonoured' : 'wishesRefused'] += 1;
  }
  const days = daysBetween(p.start, p.end) + 1;
  for (const [person, weekly] of p.contracts) if (weekly > 0 && out.has(person)) of(person).contractHours += (weekly * days) / 7;
  for (const c of out.values()) {
    c.hours = Math.round(c.hours * 100) / 100;
    c.contractHours = Math.round(c.contractHours * 100) / 100;
  }
  return out;
}
