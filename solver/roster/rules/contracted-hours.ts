/** Contracted hours (common practice, no source): hours worked plus credited absence over the period near contracted hours/week × days/7, within ± `toleranceHours`. Per hour outside. */
import { contractedTarget, creditHoursIn, formatHours } from '../../../shared/roster/derive';
import { defineRule, overBy } from './types';

export const contractedHours = defineRule({
  id: 'contractedHours',
  explain: 'People are paid for their contract; far fewer or far more hours than it is a cost either way. Leave credits its hours.',
  compile(ctx, r) {
    ctx.roster.people.forEach((person, p) => {
      const target = contractedTarget(person, ctx.days);
      if (target === undefined) return;
      const credit = creditHoursIn(ctx.credits, p, 0, ctx.days - 1);
      ctx.personCount('contractedHours', person.id, `contracted hours of ${person.name}`, p, ctx.allSeats, ctx.minutesW, (k) => overBy(r.hard, r.weight, Math.abs((k * ctx.unit) / 60 + credit - target) - r.toleranceHours), r.hard, ctx.capFor(ctx.days, true));
    });
  },
  check(ctx, r) {
    ctx.roster.people.forEach((person, p) => {
      const target = contractedTarget(person, ctx.days);
      if (target === undefined) return;
      const credit = creditHoursIn(ctx.credits, p, 0, ctx.days - 1);
      const hours = ctx.worked[p].reduce((m, x) => m + x.shift.minutes, 0) / 60 + credit;
      const dev = Math.abs(hours - target) - r.toleranceHours;
      if (dev > 1e-9)
        ctx.breach('contractedHours', r.hard, r.weight, dev, `${ctx.name(p)}: ${formatHours(hours)}${credit ? ` (${formatHours(credit)} of it credited absence)` : ''} over the period against ${formatHours(target)} contracted (± ${formatHours(r.toleranceHours)})`, [p], ctx.worked[p].map((x) => x.seat));
    });
  },
});
