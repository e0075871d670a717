/** Nights in a row (common practice, no source): at most `nights` night shifts on consecutive days, i.e. in any `nights + 1` days. Per night over. */
import type { RuleSet } from '../../../shared/roster/schema';
import { defineRule } from './types';
import { checkWindows, compileWindows, type WindowSpec } from './windows';

const spec = (r: RuleSet['maxNightsInRow']): WindowSpec => ({ term: 'maxNightsInRow', hard: r.hard, weight: r.weight, length: r.nights + 1, pick: (f) => f.night, minutes: false, credit: false, limit: () => r.nights, capped: true, nightsOnly: true });

export const maxNightsInRow = defineRule({
  id: 'maxNightsInRow',
  explain: 'Long runs of nights are a known fatigue risk; the limit is a workplace choice.',
  compile(ctx, r) {
    compileWindows(ctx, spec(r), (name, first) => `maxNightsInRow for ${name} from day ${first + 1}`);
  },
  check(ctx, r) {
    checkWindows(ctx, spec(r), (p, v, a, b) => `${ctx.name(p)}: ${v} nights on the ${r.nights + 1} days ${ctx.range(a, b)}; at most ${r.nights} in a row`);
  },
});
