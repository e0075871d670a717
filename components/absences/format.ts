import { format, parseISO } from 'date-fns';
import { ABSENCE_KIND_WORDS, type AbsenceDto, type AbsenceStatus } from '@/shared/api/absences';

export const STATUS_WORDS: Record<AbsenceStatus, string> = { requested: 'Waiting for a decision', approved: 'Approved', declined: 'Declined' };

const day = (d: string) => format(parseISO(d), 'EEE d MMM yyyy');
const shortDay = (d: string) => format(parseISO(d), 'EEE d MMM');

/** "Mon 2 Mar – Fri 13 Mar 2026 (12 days)" or "Tue 3 Mar 2026, 09:00–13:00". */
export function spanWords(a: Pick<AbsenceDto, 'startDate' | 'endDate' | 'startTime' | 'endTime'>): string {
  const days = Math.round((Date.parse(`${a.endDate}T12:00:00Z`) - Date.parse(`${a.startDate}T12:00:00Z`)) / 86_400_000) + 1;
  if (a.startDate === a.endDate) {
    if (a.startTime || a.endTime) return `${day(a.startDate)}, ${a.startTime ?? 'start of day'}–${a.endTime ?? 'end of day'}`;
    return day(a.startDate);
  }
  const from = `${a.startDate.slice(0, 4) === a.endDate.slice(0, 4) ? shortDay(a.startDate) : day(a.startDate)}${a.startTime ? ` from ${a.startTime}` : ''}`;
  const to = `${day(a.endDate)}${a.endTime ? ` until ${a.endTime}` : ''}`;
  return `${from} – ${to} (${days} days)`;
}

export const hours = (h: number) => `${Number.isInteger(h) ? h : h.toFixed(1)} h`;

/** What the absence counts toward hours, and whether that came from the workspace default. */
export const creditWords = (a: Pick<AbsenceDto, 'creditHours' | 'creditedHours'>) =>
  a.creditHours === null ? `credits ${hours(a.creditedHours)} (the default for its kind)` : `credits ${hours(a.creditedHours)}`;

export const kindWords = (k: AbsenceDto['kind']) => ABSENCE_KIND_WORDS[k];
