/** Fixed days off (a per-person term, e.g. a part-timer): no shift starting on the listed weekdays. Per shift. */
import { isoWeekday } from '../../../../shared/roster/time';
import { shiftTerm } from './shift-level';

const WEEKDAYS = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'] as const;
const cap = (s: string) => s[0].toUpperCase() + s.slice(1);

export const daysOff = shiftTerm('daysOff', 'This person has fixed days off.', (t, f) => t.weekdays.includes(WEEKDAYS[isoWeekday(f.date) - 1]), (t) => `days off ${t.weekdays.map(cap).join(', ')}`);
