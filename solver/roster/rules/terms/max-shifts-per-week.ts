/** At most `count` shifts starting in each calendar week, Monday to Sunday (a per-person term); weeks cut by the period count their days inside it. Per shift over. Caution (shared/caution.ts): local law, agreements and the workplace's fatigue policy decide. */
import { isoWeekday, addLocalDays } from '../../../../shared/roster/time';
import { covers, defineTerm, overBy } from '../types';

/** Calendar weeks of the period as [first, last] day indices. */
export function calendarWeeks(periodStart: string, days: number): { first: number; last: number }[] {
  const out: { first: number; last: number }[] = [];
  let first = 0;
  while (first < days) {
    const toSunday = 7 - isoWeekday(addLocalDays(periodStart, first));
    const last = Math.min(days - 1, first + toSunday);
    out.push({ first, last });
    first = last + 1;
  }
  return out;
}

export const maxShiftsPerWeek = defineTerm({
  kind: 'maxShiftsPerWeek',
  explain: 'This person works at most a number of shifts a week.',
  compile(ctx, p, t, i) {
    const person = ctx.roster.people[p];
    for (const w of calendarWeeks(ctx.roster.period.start, ctx.days)) {
      const seats = ctx.seatsStarting(w.first, w.last, (f) => covers(t, f));
      ctx.personCount('maxShiftsPerWeek', `${person.id}:${i}:${w.first}`, `${person.name}'s maxShiftsPerWeek term, week from day ${w.first + 1}`, p, seats, ctx.one, (k) => overBy(t.hard, t.weight, k - t.count), t.hard, ctx.capFor(w.last - w.first + 1, false));
    }
  },
  check(ctx, p, t) {
    for (const w of calendarWeeks(ctx.roster.period.start, ctx.days)) {
      const mine = ctx.worked[p].filter((x) => x.shift.day >= w.first && x.shift.day <= w.last && covers(t, x.shift));
      if (mine.length > t.count) ctx.breach('maxShiftsPerWeek', t.hard, t.weight, mine.length - t.count, `${ctx.name(p)} (term): ${mine.length} shifts in the week ${ctx.range(w.first, w.last)}; at most ${t.count}`, [p], mine.map((x) => x.seat));
    }
  },
});
