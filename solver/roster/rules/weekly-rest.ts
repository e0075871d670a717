/**
 * Weekly rest, Directive 2003/88/EC, Art. 5 with Art. 16(a): "per each seven-day period, every
 * worker is entitled to a minimum uninterrupted rest period of 24 hours plus the 11 hours'
 * daily rest referred to in Article 3"; Art. 16(a) lets the reference period run to 14 days.
 * Checked as: in every window of `days` consecutive days (rolling, wholly inside the period),
 * the person's longest stretch not overlapped by a shift they
 * work, measured in real time inside [00:00 of the window's first day, 24:00 of its last), is
 * at least `hours`. A period shorter than `days` is not checked: the article's period is seven
 * days, and the rest may fall before or after a shorter roster. With
 * days = 14 the Directive asks for two such rests (Art. 5 second paragraph, from memory:
 * "may be reduced to 24 h" where justified); Rotaloom asks for one of `hours`, so set hours
 * accordingly. Soft: `weight` per window without the rest.
 * Caution (shared/caution.ts): local law, collective agreements and the workplace's fatigue
 * policy decide; Rotaloom checks only what it is told.
 *
 * Model: the longest rest is a disjunction (some candidate interval is free), so each
 * (person, window) gets an auxiliary variable choosing the rest interval kept: intervals of
 * `hours` starting at the window's start or at the end of a shift the person could work
 * (the longest gap starts at one of those), dominated ones dropped; value j forbids the
 * person on the shifts overlapping interval j (CompileContext.auxChoice). Soft adds a value
 * "no rest" scoring −weight. bestAux picks a free interval when there is one.
 */
import { dayStartMs, formatHours, rollingWindows } from './weekly-rest-time';
import { describeShift } from '../../../shared/roster/derive';
import { defineRule, type AuxChoice } from './types';

export const weeklyRest = defineRule({
  id: 'weeklyRest',
  explain: 'Art. 5 gives 24 h of uninterrupted rest per 7 days on top of the 11 h daily rest, so 35 h in one stretch; Art. 16(a) allows a reference period of up to 14 days.',
  compile(ctx, r) {
    const H = r.hours * 3_600_000;
    const { facts, roster } = ctx;
    // per person, the seats of each shift they can take (asked for every window and choice: on
    // 200 people × 4 weeks the seats of every blocked shift were most of the compile)
    const mySeats = roster.people.map((_, p) => {
      const bySeat: number[][] = [];
      for (const f of facts) bySeat[f.index] = ctx.seatsOfShift[f.index].filter((s) => ctx.valueAt(s, p) >= 0);
      return bySeat;
    });
    // one label string per shift and per day, shared by every window and person that names it
    // (60 people × 13 weeks: 100,000 choices)
    const afterShift: string[] = [];
    const fromDay: string[] = [];
    for (const w of rollingWindows(ctx.days, r.days)) {
      if (w.last - w.first + 1 < r.days) continue; // a period shorter than the window: the rest may fall outside it
      const ws = dayStartMs(roster, w.first);
      const we = dayStartMs(roster, w.last + 1);
      if (we - ws < H) continue;
      const inWindow = facts.filter((f) => f.startMs < we && f.endMs > ws && ctx.seatsOfShift[f.index].length);
      roster.people.forEach((person, p) => {
        const mine = inWindow.filter((f) => mySeats[p]![f.index]!.length > 0);
        if (!mine.length) return;
        // candidate starts: the window's start, or the end of a shift (named by that shift: formatting
        // instants in the zone for thousands of labels was a fifth of the demo's compile time)
        const byStart = new Map<number, string>([[ws, (fromDay[w.first] ??= `rest from the start of day ${w.first + 1}`)]]);
        for (const f of mine) if (f.endMs >= ws && f.endMs + H <= we && !byStart.has(f.endMs)) byStart.set(f.endMs, (afterShift[f.index] ??= `rest after ${describeShift(f)}`));
        const cands = [...byStart.keys()].sort((a, b) => a - b).map((c) => ({ c, label: byStart.get(c)!, block: mine.filter((f) => f.startMs < c + H && f.endMs > c).map((f) => f.index) }));
        if (cands.some((k) => k.block.length === 0)) return; // some rest the person always keeps
        const subset = (a: number[], b: number[]) => a.every((x) => b.includes(x));
        const kept = cands.filter((j, jj) => !cands.some((k, kk) => kk !== jj && subset(k.block, j.block) && (k.block.length < j.block.length || kk < jj)));
        const choices: AuxChoice[] = kept.map((k) => ({
          seats: k.block.flatMap((sh) => mySeats[p]![sh]!),
          score: 0,
          label: k.label,
        }));
        if (!r.hard) choices.push({ seats: [], score: -r.weight, label: 'no weekly rest' });
        ctx.auxChoice('weeklyRest', `${person.id}:${w.first}`, `weekly rest for ${person.name} from day ${w.first + 1}`, p, w.first, w.last, choices);
      });
    }
  },
  check(ctx, r) {
    const H = r.hours * 3_600_000;
    for (const w of rollingWindows(ctx.days, r.days)) {
      if (w.last - w.first + 1 < r.days) continue;
      const ws = dayStartMs(ctx.roster, w.first);
      const we = dayStartMs(ctx.roster, w.last + 1);
      if (we - ws < H) continue;
      ctx.worked.forEach((list, p) => {
        const inside = list.filter((x) => x.shift.startMs < we && x.shift.endMs > ws);
        if (!inside.length) return;
        let cursor = ws;
        let longest = 0;
        for (const x of [...inside].sort((a, b) => a.shift.startMs - b.shift.startMs)) {
          longest = Math.max(longest, x.shift.startMs - cursor);
          cursor = Math.max(cursor, x.shift.endMs);
        }
        longest = Math.max(longest, we - cursor);
        if (longest < H)
          ctx.breach('weeklyRest', r.hard, r.weight, 1, `${ctx.name(p)}: longest rest ${formatHours(Math.round(longest / 60_000) / 60)} in the ${w.last - w.first + 1} days ${ctx.range(w.first, w.last)}; needs ${formatHours(r.hours)}`, [p], inside.map((x) => x.seat));
      });
    }
  },
});
