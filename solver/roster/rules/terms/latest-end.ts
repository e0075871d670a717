/** Latest end (a per-person term): every shift ends on its start day at or before this local time; a shift past midnight breaks it. Per shift. */
import { shiftTerm } from './shift-level';

export const latestEnd = shiftTerm(
  'latestEnd',
  'This person finishes every shift by a time of day.',
  (t, f, roster) => {
    const s = roster.shifts[f.index];
    return s.end.slice(0, 10) !== s.start.slice(0, 10) || s.end.slice(11, 16) > t.time;
  },
  (t) => `done by ${t.time}`,
);
