/**
 * Average working week, Directive 2003/88/EC, Art. 6(b) with Art. 16(b): "the average working
 * time for each seven-day period, including overtime, does not exceed 48 hours", averaged over
 * a reference period "not exceeding four months"; paid annual leave and sick leave "shall not be
 * included or shall be neutral in the calculation of the average". Checked as: over every
 * window of `referenceDays` days (default the roster period, at most 123 days ≈ 4 months;
 * rolling when shorter than the period), hours of the shifts starting in it plus the credited
 * absence hours of its days (that is how leave stays neutral: it counts as the hours it
 * credits) at most `hours` × days / 7. A window shorter than a week is held to one week's
 * `hours` (the Directive's unit is the week). Soft: `weight` per hour over the window's total.
 * Caution (shared/caution.ts): local law, collective agreements and the workplace's fatigue
 * policy decide; Rotaloom checks only what it is told.
 */
import { formatHours } from '../../../shared/roster/derive';
import type { RuleSet } from '../../../shared/roster/schema';
import { defineRule } from './types';
import { checkWindows, compileWindows, type WindowSpec } from './windows';

/** Art. 16(b): at most four months; 123 days is the longest four calendar months. */
export const MAX_REFERENCE_DAYS = 123;

export function averageWindowDays(r: RuleSet['averageWeeklyHours'], days: number): number {
  return Math.min(days, r.referenceDays ?? MAX_REFERENCE_DAYS);
}

const spec = (r: RuleSet['averageWeeklyHours'], days: number): WindowSpec => ({
  term: 'averageWeeklyHours',
  hard: r.hard,
  weight: r.weight,
  length: averageWindowDays(r, days),
  pick: () => true,
  minutes: true,
  credit: true,
  limit: (n) => (r.hours * Math.max(7, n)) / 7,
  capped: false,
  nightsOnly: false,
});

export const averageWeeklyHours = defineRule({
  id: 'averageWeeklyHours',
  explain: 'Art. 6 caps the average working week at 48 h including overtime; Art. 16(b) lets it be averaged over up to four months, with leave neutral.',
  compile(ctx, r) {
    compileWindows(ctx, spec(r, ctx.days), (name, first) => `average week of ${name} from day ${first + 1}`);
  },
  check(ctx, r) {
    checkWindows(ctx, spec(r, ctx.days), (p, v, a, b, limit, credit) => {
      const n = b - a + 1;
      return `${ctx.name(p)}: ${formatHours(v)}${credit ? ` (${formatHours(credit)} of it credited absence)` : ''} in the ${n} days ${ctx.range(a, b)}, an average of ${formatHours((v * 7) / Math.max(7, n))} a week; at most ${formatHours(r.hours)} (${formatHours(limit)})`;
    });
  },
});
