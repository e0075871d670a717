/** Coverage (common practice, no source): each open seat costs `weight`; hard = no seat may stay open (the driver then drops `open` from every domain it can). */
import { describeShift } from '../../../shared/roster/derive';
import { defineRule } from './types';

export const coverage = defineRule({
  id: 'coverage',
  explain: 'An open seat is a gap in the rota: the weight is what leaving one seat open costs against the other rules.',
  compile(ctx, r) {
    if (r.hard) return;
    ctx.roster.seats.forEach((seat, s) => {
      const d = ctx.domains[s];
      if (!d.includes(-1)) return;
      const table = new Float64Array(d.length);
      table[d.indexOf(-1)] = -r.weight;
      ctx.factors.push({ kind: 'unary', v: s, table, id: `coverage:${seat.id}`, label: `open seat on ${describeShift(ctx.facts[ctx.seatShift[s]])}` });
    });
  },
  check(ctx, r) {
    ctx.holder.forEach((p, s) => {
      if (p >= 0) return;
      const seat = ctx.roster.seats[s];
      const f = ctx.facts[ctx.roster.shifts.findIndex((x) => x.id === seat.shift)];
      ctx.breach('coverage', r.hard, r.weight, 1, `a ${seat.skill ? `${ctx.skillName(seat.skill)} ` : ''}seat on ${describeShift(f)} is open`, [], [s]);
    });
  },
});
