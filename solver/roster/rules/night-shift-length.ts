/**
 * Night shift length: a local option, stricter than Directive 2003/88/EC Art. 8(a) (an
 * average, see night-average.ts) and like Art. 8(b) for night work with special hazards: no
 * single night shift longer than `hours`. Hard: nobody may work such a night (it leaves every
 * domain); soft: `weight` per person working one.
 * Caution (shared/caution.ts): local law, collective agreements and the workplace's fatigue
 * policy decide; Rotaloom checks only what it is told.
 */
import { describeShift, formatHours } from '../../../shared/roster/derive';
import { defineRule } from './types';

export const nightShiftLength = defineRule({
  id: 'nightShiftLength',
  explain: 'A cap on any one night, stricter than the Directive’s 8 h average for night workers.',
  excludesShift: (r, f) => f.night && f.minutes > r.hours * 60,
  compile(ctx, r) {
    if (r.hard) return;
    ctx.roster.seats.forEach((seat, s) => {
      const f = ctx.facts[ctx.seatShift[s]];
      if (!(f.night && f.minutes > r.hours * 60)) return;
      const d = ctx.domains[s];
      const table = new Float64Array(d.length);
      d.forEach((p, x) => {
        if (p !== -1) table[x] = -r.weight;
      });
      ctx.factors.push({ kind: 'unary', v: s, table, id: `nightShiftLength:${seat.id}`, label: `night longer than ${r.hours} h on ${describeShift(f)}` });
    });
  },
  check(ctx, r) {
    ctx.worked.forEach((list, p) => {
      for (const x of list)
        if (x.shift.night && x.shift.minutes > r.hours * 60)
          ctx.breach('nightShiftLength', r.hard, r.weight, 1, `${ctx.name(p)} works ${describeShift(x.shift)}, a ${formatHours(x.shift.hours)} night; at most ${formatHours(r.hours)}`, [p], [x.seat]);
    });
  },
});
