/**
 * Hard limits bound how much anyone can feasibly work in a span of days. Person-level tables
 * stop there (the model type repeats a table's last entry for larger sums), which keeps the
 * counting DPs small: sums past the cap break a hard factor anyway, so no feasible score
 * changes. The rules that give caps (shifts per window, hours per 7 days, the average week)
 * are never capped themselves (that would be circular).
 */
import type { Roster } from '../../../shared/roster/schema';
import { averageWindowDays } from './average-weekly-hours';

/** Cap in shifts (count) or in weight units (minutes / unit) over any `spanDays` days. */
export function capFor(roster: Roster, days: number, spanDays: number, minutesWeighted: boolean, unit: number, minShiftMinutes: number, maxShiftMinutes: number): number {
  const rules = roster.rules;
  const on = (t: keyof typeof rules) => rules[t].enabled && rules[t].hard;
  let countCap = Infinity;
  let unitCap = Infinity;
  const hoursCap = (windowDays: number, limitMinutes: number) => {
    const blocks = Math.ceil(spanDays / windowDays);
    countCap = Math.min(countCap, blocks * Math.floor(limitMinutes / minShiftMinutes));
    unitCap = Math.min(unitCap, blocks * Math.floor(limitMinutes / unit));
  };
  if (on('shiftsPerWindow')) countCap = Math.min(countCap, Math.ceil(spanDays / Math.min(days, rules.shiftsPerWindow.days)) * rules.shiftsPerWindow.maxShifts);
  if (on('maxHoursPer7Days')) hoursCap(Math.min(days, 7), rules.maxHoursPer7Days.hours * 60);
  if (on('averageWeeklyHours')) {
    const len = averageWindowDays(rules.averageWeeklyHours, days);
    hoursCap(len, (rules.averageWeeklyHours.hours * 60 * Math.max(7, len)) / 7);
  }
  if (!minutesWeighted) return countCap;
  return Math.min(unitCap, countCap === Infinity ? Infinity : Math.ceil((countCap * maxShiftMinutes) / unit));
}
