/** Consecutive working days (common practice, no source): at most `days` days in a row with a shift start, i.e. at most `days` shifts in any `days + 1` days. Per shift over. */
import type { RuleSet } from '../../../shared/roster/schema';
import { defineRule } from './types';
import { checkWindows, compileWindows, type WindowSpec } from './windows';

const spec = (r: RuleSet['maxConsecutiveDays']): WindowSpec => ({ term: 'maxConsecutiveDays', hard: r.hard, weight: r.weight, length: r.days + 1, pick: () => true, minutes: false, credit: false, limit: () => r.days, capped: true, nightsOnly: false });

export const maxConsecutiveDays = defineRule({
  id: 'maxConsecutiveDays',
  explain: 'A long run of working days tires people even with the legal rest in between; the limit is a workplace choice.',
  compile(ctx, r) {
    compileWindows(ctx, spec(r), (name, first) => `maxConsecutiveDays for ${name} from day ${first + 1}`);
  },
  check(ctx, r) {
    checkWindows(ctx, spec(r), (p, v, a, b) => `${ctx.name(p)}: ${v} shifts on the ${r.days + 1} days ${ctx.range(a, b)}; at most ${r.days} days in a row`);
  },
});
