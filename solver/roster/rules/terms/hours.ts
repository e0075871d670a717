/**
 * Hour bounds (per-person terms): hours worked on the shifts the term covers (starting on or
 * after `from`) plus the credited absence hours of the covered days, at least (minHours) or at
 * most (maxHours) `hours`. Per hour short or over. Caution (shared/caution.ts): local law,
 * agreements and the workplace's fatigue policy decide.
 */
import { creditHoursIn, dayIndex, formatDay, formatHours } from '../../../../shared/roster/derive';
import type { Roster } from '../../../../shared/roster/schema';
import { covers, defineTerm, overBy, type CheckContext, type CompileContext } from '../types';

type HoursTerm = { hours: number; hard: boolean; weight: number; from?: string };

const fromDay = (roster: Roster, t: { from?: string }) => (t.from === undefined ? 0 : Math.max(0, dayIndex(roster, t.from)));

function hoursTerm<K extends 'minHours' | 'maxHours'>(kind: K, sign: 1 | -1, explain: string) {
  const breachOf = (hard: boolean, weight: number, limit: number, h: number) => overBy(hard, weight, sign * (h - limit));
  return defineTerm<K>({
    kind,
    explain,
    compile(ctx: CompileContext, p, term, i) {
      const t = term as unknown as HoursTerm;
      const first = fromDay(ctx.roster, t);
      const credit = creditHoursIn(ctx.credits, p, first, ctx.days - 1);
      const seats = ctx.allSeats.filter((s) => covers(t, ctx.facts[ctx.seatShift[s]]));
      const person = ctx.roster.people[p];
      ctx.personCount(kind, `${person.id}:${i}`, `${person.name}'s ${kind} term`, p, seats, ctx.minutesW, (k) => breachOf(t.hard, t.weight, t.hours, (k * ctx.unit) / 60 + credit), t.hard, ctx.capFor(ctx.days, true));
    },
    check(ctx: CheckContext, p, term) {
      const t = term as unknown as HoursTerm;
      const first = fromDay(ctx.roster, t);
      const credit = creditHoursIn(ctx.credits, p, first, ctx.days - 1);
      const mine = ctx.worked[p].filter((x) => covers(t, x.shift));
      const h = mine.reduce((m, x) => m + x.shift.minutes, 0) / 60 + credit;
      const units = sign * (h - t.hours);
      if (units > 1e-9)
        ctx.breach(kind, t.hard, t.weight, units, `${ctx.name(p)} (term): ${formatHours(h)}${credit ? ` (${formatHours(credit)} of it credited absence)` : ''} from ${formatDay(t.from ?? ctx.roster.period.start)}; ${sign > 0 ? 'at most' : 'at least'} ${formatHours(t.hours)}`, [p], mine.map((x) => x.seat));
    },
  });
}

export const minHours = hoursTerm('minHours', -1, 'This person is to work at least a number of hours.');
export const maxHours = hoursTerm('maxHours', 1, 'This person is to work at most a number of hours.');
