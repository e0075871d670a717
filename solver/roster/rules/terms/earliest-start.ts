/** Earliest start (a per-person term): no shift starting before this local time of day. Per shift. */
import { shiftTerm } from './shift-level';

export const earliestStart = shiftTerm('earliestStart', 'This person starts no shift before a time of day.', (t, f, roster) => roster.shifts[f.index].start.slice(11, 16) < t.time, (t) => `not before ${t.time}`);
