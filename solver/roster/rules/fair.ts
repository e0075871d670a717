/**
 * Fair spread of nights and weekend shifts (common practice, no source): nobody works more
 * such shifts than their fair share (shared/roster/derive.ts fairShares), rounded up. Per shift over.
 */
import { fairShares, type ShiftFacts } from '../../../shared/roster/derive';
import { defineRule, overBy, type CheckContext, type CompileContext } from './types';

function fairRule<Id extends 'fairNights' | 'fairWeekends'>(id: Id, pick: (f: ShiftFacts) => boolean, noun: string, explain: string) {
  return defineRule({
    id,
    explain,
    compile(ctx: CompileContext, r) {
      const seats = ctx.allSeats.filter((s) => pick(ctx.facts[ctx.seatShift[s]]));
      for (const [p, share] of fairShares(ctx.roster, ctx.facts, pick))
        ctx.personCount(id, ctx.roster.people[p].id, `${id} for ${ctx.roster.people[p].name}`, p, seats, ctx.one, (k) => overBy(r.hard, r.weight, k - share), r.hard, ctx.capFor(ctx.days, false));
    },
    check(ctx: CheckContext, r) {
      const shares = ctx.memo(id, () => fairShares(ctx.roster, ctx.facts, pick));
      for (const [p, share] of shares) {
        const mine = ctx.worked[p].filter((x) => pick(x.shift));
        const over = mine.length - share;
        if (over > 0) ctx.breach(id, r.hard, r.weight, over, `${ctx.name(p)}: ${mine.length} ${noun}; fair share is ${share}`, [p], mine.map((x) => x.seat));
      }
    },
  });
}

export const fairNights = fairRule('fairNights', (f) => f.night, 'night shifts', 'Nights are shared by the people who can work them, in proportion to their contracts.');
export const fairWeekends = fairRule('fairWeekends', (f) => f.weekend, 'weekend shifts', 'Weekend shifts are shared by the people who can work them, in proportion to their contracts.');
