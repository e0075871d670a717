/**
 * Rolling-window counting shared by the window rules (shifts per window, hours per 7 days,
 * consecutive days, nights in a row, the average week, night work): one counting factor per
 * person and window over the seats starting in it; the scorer counts the same shifts.
 * Windows start on each day of the period and lie wholly inside it; a period shorter than the
 * window is one window (shared/roster/derive.ts rollingWindows). Shifts count for the day
 * they start on.
 */
import { creditHoursIn, rollingWindows, type ShiftFacts } from '../../../shared/roster/derive';
import type { TermName } from '../term-names';
import { overBy, type CheckContext, type CompileContext, type Worked } from './types';

export type WindowSpec = {
  term: TermName;
  hard: boolean;
  weight: number;
  length: number;
  pick: (f: ShiftFacts) => boolean;
  /** Sum minutes (value in hours) instead of counting shifts. */
  minutes: boolean;
  /** Add credited absence hours of the window's days (hours rules only). */
  credit: boolean;
  /** The limit for a window of `days` days (hours or shifts). */
  limit: (days: number) => number;
  /** Cap the tables by the hard weekly limits (false for the rules that give the caps). */
  capped: boolean;
  /** Only people for whom this holds (e.g. night workers). */
  who?: (p: number) => boolean;
  /** Merge group: factors with equal seats and weights merge across rules. */
  nightsOnly: boolean;
};

export function compileWindows(ctx: CompileContext, w: WindowSpec, label: (name: string, first: number) => string): void {
  for (const win of rollingWindows(ctx.days, w.length)) {
    const seats = ctx.seatsStarting(win.first, win.last, w.pick);
    const n = win.last - win.first + 1;
    const limit = w.limit(n);
    const cap = w.capped ? ctx.capFor(n, w.minutes) : Infinity;
    ctx.roster.people.forEach((person, p) => {
      if (w.who && !w.who(p)) return;
      const credit = w.credit ? creditHoursIn(ctx.credits, p, win.first, win.last) : 0;
      const value = w.minutes ? (k: number) => (k * ctx.unit) / 60 + credit : (k: number) => k;
      ctx.personCount(w.term, `${person.id}:${win.first}`, label(person.name, win.first), p, seats, w.minutes ? ctx.minutesW : ctx.one, (k) => overBy(w.hard, w.weight, value(k) - limit), w.hard, cap, `${win.first}:${win.last}:${w.nightsOnly}:${p}`);
    });
  }
}

export function checkWindows(ctx: CheckContext, w: WindowSpec, words: (p: number, value: number, first: number, last: number, limit: number, credit: number) => string): void {
  for (const win of rollingWindows(ctx.days, w.length)) {
    const n = win.last - win.first + 1;
    const limit = w.limit(n);
    ctx.worked.forEach((list, p) => {
      if (w.who && !w.who(p)) return;
      const inside: Worked[] = list.filter((x) => x.shift.day >= win.first && x.shift.day <= win.last && w.pick(x.shift));
      const credit = w.credit ? creditHoursIn(ctx.credits, p, win.first, win.last) : 0;
      if (inside.length === 0 && credit === 0) return;
      const value = w.minutes ? inside.reduce((m, x) => m + x.shift.minutes, 0) / 60 + credit : inside.length;
      const over = value - limit;
      if (over > 1e-9)
        ctx.breach(w.term, w.hard, w.weight, over, words(p, value, win.first, win.last, limit, credit), [p], inside.map((x) => x.seat));
    });
  }
}
