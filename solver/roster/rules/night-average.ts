/**
 * Night work, Directive 2003/88/EC, Art. 8(a): "normal hours of work for night workers do not
 * exceed an average of eight hours in any 24-hour period", with the reference period of
 * Art. 16(c) (defined after consultation; here `referenceDays`, default the roster period,
 * rolling when shorter). Our reading:
 * - Night worker (Art. 2(4)) is decided statically, from the roster alone: anyone who holds the
 *   skill of some night seat (a seat with no skill: everyone), unless a hard no-nights term
 *   without a `from` date covers them. A person who could be given nights is held to the night
 *   workers' limit whether or not this roster gives them any (stricter than judging from the
 *   roster chosen, and it keeps the rule a fixed set of counting factors).
 * - The average counts every shift the night worker starts in the window (their normal hours
 *   of work, not only the night part), over the window's days less one weekly rest day per
 *   full 7 days: Art. 16(c) says the Art. 5 weekly rest falling in the reference period is not
 *   included in the average (recalled from memory of the article's text, not re-checked). So
 *   the limit is `hours` × (days − ⌊days / 7⌋): 8 × 24 = 192 h over 28 days.
 * - Absences add no hours here and their days stay in the divisor (our choice: the article
 *   says nothing of leave for night work; Art. 16(b)'s neutral leave is about Art. 6).
 * Soft: `weight` per hour over the window's total. `nightShiftLength` is the stricter local
 * option (no single night longer than 8 h, as Art. 8(b) asks for hazardous night work).
 * Caution (shared/caution.ts): local law, collective agreements and the workplace's fatigue
 * policy decide; Rotaloom checks only what it is told.
 */
import { formatHours } from '../../../shared/roster/derive';
import type { Roster, RuleSet } from '../../../shared/roster/schema';
import { defineRule } from './types';
import { checkWindows, compileWindows, type WindowSpec } from './windows';

/** Person index → night worker (see the doc comment). */
export function nightWorkers(roster: Roster, isNightShift: (shiftId: string) => boolean): boolean[] {
  const nightSkills = new Set<string | null>();
  for (const seat of roster.seats) if (isNightShift(seat.shift)) nightSkills.add(seat.skill);
  return roster.people.map((p) => {
    if (p.terms.some((t) => t.kind === 'noNights' && t.hard && t.from === undefined)) return false;
    return nightSkills.has(null) || p.skills.some((s) => nightSkills.has(s));
  });
}

export const nightAllowance = (hours: number, n: number) => hours * (n - Math.floor(n / 7));

const spec = (r: RuleSet['nightAverage'], days: number, who: boolean[]): WindowSpec => ({
  term: 'nightAverage',
  hard: r.hard,
  weight: r.weight,
  length: Math.min(days, r.referenceDays ?? days),
  pick: () => true,
  minutes: true,
  credit: false,
  limit: (n) => nightAllowance(r.hours, n),
  capped: true,
  who: (p) => who[p],
  nightsOnly: false,
});

const workersOf = (roster: Roster, facts: { id: string; night: boolean }[]) => {
  const night = new Map(facts.map((f) => [f.id, f.night]));
  return nightWorkers(roster, (id) => night.get(id) ?? false);
};

export const nightAverage = defineRule({
  id: 'nightAverage',
  explain: 'Art. 8 limits night workers to 8 h on average per 24 h; the weekly rest days are left out of the average (Art. 16(c)).',
  compile(ctx, r) {
    compileWindows(ctx, spec(r, ctx.days, workersOf(ctx.roster, ctx.facts)), (name, first) => `night work average of ${name} from day ${first + 1}`);
  },
  check(ctx, r) {
    const who = ctx.memo('nightWorkers', () => workersOf(ctx.roster, ctx.facts));
    checkWindows(ctx, spec(r, ctx.days, who), (p, v, a, b, limit) => {
      const n = b - a + 1;
      return `${ctx.name(p)} (night worker): ${formatHours(v)} in the ${n} days ${ctx.range(a, b)}; at most ${formatHours(r.hours)} a day on average over ${n - Math.floor(n / 7)} days (${formatHours(limit)})`;
    });
  },
});
