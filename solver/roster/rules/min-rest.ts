/**
 * Daily rest, Directive 2003/88/EC, Art. 3: 11 consecutive hours of rest in every 24, read as
 * at least `hours` from the end of one shift to the start of the next for the same person.
 * Caution (shared/caution.ts): local law, collective agreements and the workplace's fatigue
 * policy decide; Rotaloom checks only what it is told.
 */
import { describeShift, formatHours } from '../../../shared/roster/derive';
import { defineRule } from './types';

export const minRest = defineRule({
  id: 'minRest',
  explain: 'Art. 3 gives every worker 11 consecutive hours of rest per 24-hour period; a late shift followed by an early one is the usual breach.',
  compile(ctx, r) {
    const { facts, seatsOfShift, domains } = ctx;
    const restMs = r.hours * 3_600_000;
    const byStart = facts.map((f) => f.index).sort((a, b) => facts[a].startMs - facts[b].startMs || a - b);
    const shareSomeone = (a: number[], b: number[]) => {
      const s = new Set<number>();
      for (const v of a) for (const p of domains[v]) if (p !== -1) s.add(p);
      for (const v of b) for (const p of domains[v]) if (p !== -1 && s.has(p)) return true;
      return false;
    };
    for (let i = 0; i < byStart.length; i++) {
      const A = facts[byStart[i]];
      for (let j = i + 1; j < byStart.length; j++) {
        const B = facts[byStart[j]];
        // sorted by start: once B starts a full rest after A ends, no later shift follows A too closely
        if (B.startMs >= A.endMs + restMs) break;
        const sa = seatsOfShift[A.index];
        const sb = seatsOfShift[B.index];
        if (!sa.length || !sb.length) continue;
        const [first, second] = A.endMs <= B.startMs ? [A, B] : B.endMs <= A.startMs ? [B, A] : [null, null];
        if (first === null || second === null) continue; // overlapping: double booking, not rest
        const gap = Math.round((second.startMs - first.endMs) / 60_000);
        if (gap >= r.hours * 60 || !shareSomeone(sa, sb)) continue;
        const label = `rest between ${describeShift(first)} and ${describeShift(second)}`;
        if (r.hard) {
          ctx.factors.push({ kind: 'allDifferent', vars: [...sa, ...sb], id: `minRest:${first.id}:${second.id}`, label });
        } else {
          for (const a of sa)
            for (const b of sb)
              if (domains[a].some((p) => p !== -1 && ctx.valueAt(b, p) >= 0))
                ctx.factors.push({ kind: 'sameKey', a, b, weight: -r.weight, id: `minRest:${first.id}:${second.id}`, label });
        }
      }
    }
  },
  check(ctx, r) {
    ctx.worked.forEach((list, p) => {
      for (let i = 0; i < list.length; i++)
        for (let j = i + 1; j < list.length; j++) {
          const a = list[i].shift;
          const b = list[j].shift;
          if (a.startMs < b.endMs && b.startMs < a.endMs) continue;
          const [first, second] = a.endMs <= b.startMs ? [a, b] : [b, a];
          const gapMinutes = Math.round((second.startMs - first.endMs) / 60_000);
          if (gapMinutes < r.hours * 60)
            ctx.breach('minRest', r.hard, r.weight, 1, `${ctx.name(p)}: ${formatHours(gapMinutes / 60)} rest between ${describeShift(first)} and ${describeShift(second)}; minimum ${formatHours(r.hours)}`, [p], [list[i].seat, list[j].seat]);
        }
    });
  },
});
