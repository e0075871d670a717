/** At most `count` night shifts among the covered shifts (a per-person term). Per night over. Caution (shared/caution.ts): local law, agreements and the workplace's fatigue policy decide. */
import { covers, defineTerm, overBy } from '../types';

export const maxNights = defineTerm({
  kind: 'maxNights',
  explain: 'This person works at most a number of nights.',
  compile(ctx, p, t, i) {
    const seats = ctx.allSeats.filter((s) => ctx.facts[ctx.seatShift[s]].night && covers(t, ctx.facts[ctx.seatShift[s]]));
    const person = ctx.roster.people[p];
    ctx.personCount('maxNights', `${person.id}:${i}`, `${person.name}'s maxNights term`, p, seats, ctx.one, (k) => overBy(t.hard, t.weight, k - t.count), t.hard, ctx.capFor(ctx.days, false));
  },
  check(ctx, p, t) {
    const mine = ctx.worked[p].filter((x) => x.shift.night && covers(t, x.shift));
    if (mine.length > t.count) ctx.breach('maxNights', t.hard, t.weight, mine.length - t.count, `${ctx.name(p)} (term): ${mine.length} nights; at most ${t.count}`, [p], mine.map((x) => x.seat));
  },
});
