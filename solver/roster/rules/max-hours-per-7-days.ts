/**
 * Hours in any 7 days: local policy, stricter than Directive 2003/88/EC Art. 6 (which
 * averages 48 h over up to four months, see average-weekly-hours.ts): hours of the shifts
 * starting in every 7 consecutive days plus credited absence hours, at most `hours`. Off by
 * default. Soft: `weight` per hour over, per window.
 * Caution (shared/caution.ts): local law, collective agreements and the workplace's fatigue
 * policy decide; Rotaloom checks only what it is told.
 */
import { formatHours } from '../../../shared/roster/derive';
import type { RuleSet } from '../../../shared/roster/schema';
import { defineRule } from './types';
import { checkWindows, compileWindows, type WindowSpec } from './windows';

const spec = (r: RuleSet['maxHoursPer7Days']): WindowSpec => ({ term: 'maxHoursPer7Days', hard: r.hard, weight: r.weight, length: 7, pick: () => true, minutes: true, credit: true, limit: () => r.hours, capped: false, nightsOnly: false });

export const maxHoursPer7Days = defineRule({
  id: 'maxHoursPer7Days',
  explain: 'A workplace cap on any single week; the Directive itself only limits the average (Art. 6).',
  compile(ctx, r) {
    compileWindows(ctx, spec(r), (name, first) => `maxHoursPer7Days for ${name} from day ${first + 1}`);
  },
  check(ctx, r) {
    checkWindows(ctx, spec(r), (p, v, a, b) => `${ctx.name(p)}: ${formatHours(v)} in the 7 days ${ctx.range(a, b)}; at most ${formatHours(r.hours)}`);
  },
});
