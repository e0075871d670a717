/**
 * At most `count` weekends worked among the covered shifts (a per-person term); a weekend
 * counts when a shift starts on its Saturday or Sunday. Per weekend over.
 *
 * "Weekends with a shift" is a count of ORs, which one counting factor cannot express, so the
 * person gets one auxiliary variable whose values are the sets of weekends they may work
 * (hard: every set of `count` weekends; soft: every set of at least `count`, scoring −weight
 * per weekend past `count`); value S forbids the person's seats on weekends outside S. The
 * number of values grows as binomials of the weekends the person could work: past
 * MAX_WEEKEND_SETS the compiler refuses with a message rather than build a huge variable.
 */
import { weekendOf } from '../../../../shared/roster/derive';
import { addLocalDays } from '../../../../shared/roster/time';
import { covers, defineTerm, type AuxChoice } from '../types';

export const MAX_WEEKEND_SETS = 4096;


function subsets(n: number, minSize: number, maxSize: number): number[][] {
  const out: number[][] = [];
  const rec = (start: number, cur: number[]) => {
    if (cur.length >= minSize) out.push([...cur]);
    if (cur.length === maxSize || out.length > MAX_WEEKEND_SETS) return;
    for (let i = start; i < n; i++) {
      cur.push(i);
      rec(i + 1, cur);
      cur.pop();
    }
  };
  rec(0, []);
  return out;
}

export const maxWeekends = defineTerm({
  kind: 'maxWeekends',
  explain: 'This person works at most a number of weekends.',
  compile(ctx, p, t, i) {
    const person = ctx.roster.people[p];
    const byWeekend = new Map<string, number[]>();
    for (const s of ctx.allSeats) {
      const f = ctx.facts[ctx.seatShift[s]];
      if (!f.weekend || !covers(t, f) || ctx.valueAt(s, p) < 0) continue;
      const k = weekendOf(f.date);
      byWeekend.set(k, [...(byWeekend.get(k) ?? []), s]);
    }
    const weekends = [...byWeekend.keys()].sort();
    const W = weekends.length;
    if (W <= t.count) return;
    const sets = t.hard ? subsets(W, t.count, t.count) : subsets(W, t.count, W);
    if (sets.length > MAX_WEEKEND_SETS) throw new Error(`${person.name}'s weekend term covers ${W} weekends with at most ${t.count}: too many choices for the exact model (more than ${MAX_WEEKEND_SETS}); split it with a later \`from\` or raise the count`);
    const days = weekends.map((w) => ctx.facts.find((f) => f.date === w || f.date === addLocalDays(w, 1))!.day);
    const choices: AuxChoice[] = sets.map((S) => ({
      seats: weekends.flatMap((w, k) => (S.includes(k) ? [] : byWeekend.get(w)!)),
      score: -t.weight * Math.max(0, S.length - t.count),
      label: S.length ? `weekends of ${S.map((k) => weekends[k]).join(', ')}` : 'no weekends',
    }));
    ctx.auxChoice("maxWeekends", `${person.id}:${i}`, `${person.name}'s maxWeekends term`, p, Math.min(...days), Math.min(ctx.days - 1, Math.max(...days) + 1), choices);
  },
  check(ctx, p, t) {
    const mine = ctx.worked[p].filter((x) => x.shift.weekend && covers(t, x.shift));
    const weekends = new Set(mine.map((x) => weekendOf(x.shift.date)));
    if (weekends.size > t.count) ctx.breach('maxWeekends', t.hard, t.weight, weekends.size - t.count, `${ctx.name(p)} (term): ${weekends.size} weekends worked; at most ${t.count}`, [p], mine.map((x) => x.seat));
  },
});
