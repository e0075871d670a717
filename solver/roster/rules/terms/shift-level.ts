/**
 * Shift-level per-person terms: whether working one shift breaks the term depends on that
 * shift alone. Hard: the shift leaves the person's domain (compile.ts); soft: a unary of
 * −weight on the person's value in each such seat. The scorer checks each worked shift.
 */
import { describeShift, type ShiftFacts } from '../../../../shared/roster/derive';
import type { Roster, TermKind } from '../../../../shared/roster/schema';
import { covers, defineTerm, type TermOf } from '../types';

export function shiftTerm<K extends TermKind>(kind: K, explain: string, breaks: (t: TermOf<K>, f: ShiftFacts, roster: Roster) => boolean, what: (t: TermOf<K>) => string) {
  return defineTerm<K>({
    kind,
    explain,
    breaksShift: (t, f, roster) => covers(t, f) && breaks(t, f, roster),
    check(ctx, p, t) {
      for (const x of ctx.worked[p])
        if (covers(t, x.shift) && breaks(t, x.shift, ctx.roster))
          ctx.breach(kind, t.hard, t.weight, 1, `${ctx.name(p)} (term: ${what(t)}) works ${describeShift(x.shift)}`, [p], [x.seat]);
    },
  });
}
