/**
 * Shifts in a window: local policy, no source. At most `maxShifts` shifts start in any `days`
 * consecutive days (before the weekly rest rule measured real rest, this was how Rotaloom
 * approximated Art. 5: six shifts in seven days leaves a day without a shift start). Off by
 * default. Soft: `weight` per shift over.
 * Caution (shared/caution.ts): local law, collective agreements and the workplace's fatigue
 * policy decide; Rotaloom checks only what it is told.
 */
import type { RuleSet } from '../../../shared/roster/schema';
import { defineRule } from './types';
import { checkWindows, compileWindows, type WindowSpec } from './windows';

const spec = (r: RuleSet['shiftsPerWindow']): WindowSpec => ({ term: 'shiftsPerWindow', hard: r.hard, weight: r.weight, length: r.days, pick: () => true, minutes: false, credit: false, limit: () => r.maxShifts, capped: false, nightsOnly: false });

export const shiftsPerWindow = defineRule({
  id: 'shiftsPerWindow',
  explain: 'A workplace limit on how many shifts may start in a run of days; not a rule of the Directive.',
  compile(ctx, r) {
    compileWindows(ctx, spec(r), (name, first) => `shiftsPerWindow for ${name} from day ${first + 1}`);
  },
  check(ctx, r) {
    checkWindows(ctx, spec(r), (p, v, a, b) => `${ctx.name(p)}: ${v} shifts in the ${r.days} days ${ctx.range(a, b)}; at most ${r.maxShifts}`);
  },
});
