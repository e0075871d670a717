/**
 * A quick feasible-minded first roster to start the solver from (MapOptions.initial): shifts
 * in time order, skilled seats first, each seat to the candidate who keeps every hard rule
 * so far and costs least by a rough local score (hours below contract first, wishes, soft
 * rules). Not optimal; it gives local search a roster that covers the seats instead of the
 * unary argmax, which on rosters with hard windows is often infeasible everywhere.
 */
import { contractedTarget, periodDays } from '../../shared/roster/derive';
import { OPEN, type CompiledRoster } from './compile';

export function greedyAssignment(compiled: CompiledRoster): Int32Array {
  const { roster, facts, domains } = compiled;
  const rules = roster.rules;
  const on = (t: keyof typeof rules) => rules[t].enabled && (rules[t].hard || rules[t].weight > 0);
  const days = periodDays(roster);
  const shiftIdx = new Map(roster.shifts.map((s, i) => [s.id, i]));
  const personIdx = new Map(roster.people.map((p, i) => [p.id, i]));
  const seatShift = roster.seats.map((s) => shiftIdx.get(s.shift)!);
  const wish = new Map<string, number>();
  for (const w of roster.wishes) {
    if (w.kind === 'cannot') continue;
    const p = personIdx.get(w.person)!;
    for (const f of facts) if (w.shift === f.id || w.date === f.date) wish.set(`${p}:${f.index}`, (wish.get(`${p}:${f.index}`) ?? 0) + (w.kind === 'prefer' ? w.strength : -w.strength));
  }
  const never = new Set(roster.pairings.filter((p) => p.never).flatMap((p) => [`${personIdx.get(p.a)}:${personIdx.get(p.b)}`, `${personIdx.get(p.b)}:${personIdx.get(p.a)}`]));
  const target = roster.people.map((p) => contractedTarget(p, days) ?? (days / 7) * 30);
  const worked: number[][] = roster.people.map(() => []);
  const minutes = roster.people.map(() => 0);
  const onShift: number[][] = roster.shifts.map(() => []);
  const x = new Int32Array(domains.length);

  const order = roster.seats
    .map((_, s) => s)
    .sort((a, b) => facts[seatShift[a]].startMs - facts[seatShift[b]].startMs || domains[a].length - domains[b].length || a - b);

  /** Would p on shift f break a rule? 'hard' = never, 'soft' = only if nobody else. */
  const check = (p: number, fi: number): 'ok' | 'soft' | 'hard' => {
    const f = facts[fi];
    let soft = false;
    const mine = worked[p].map((k) => facts[k]);
    for (const o of mine) {
      if (o.startMs < f.endMs && f.startMs < o.endMs) return 'hard';
      const gap = Math.min(Math.abs(f.startMs - o.endMs), Math.abs(o.startMs - f.endMs));
      if (on('minRest') && gap < rules.minRest.hours * 3_600_000) {
        if (rules.minRest.hard) return 'hard';
        soft = true;
      }
    }
    for (const q of onShift[fi]) if (never.has(`${p}:${q}`)) return 'hard';
    const count = (len: number, pick: (d: typeof f) => boolean) => mine.filter((o) => o.day > f.day - len && o.day <= f.day && pick(o)).length + 1;
    const limits: [keyof typeof rules, boolean][] = [
      ['weeklyRest', count(rules.weeklyRest.days, () => true) > rules.weeklyRest.maxShifts],
      ['maxHoursPer7Days', mine.filter((o) => o.day > f.day - 7 && o.day <= f.day).reduce((m, o) => m + o.minutes, f.minutes) > rules.maxHoursPer7Days.hours * 60],
      ['maxConsecutiveDays', count(rules.maxConsecutiveDays.days + 1, () => true) > rules.maxConsecutiveDays.days],
      ['maxNightsInRow', f.night && count(rules.maxNightsInRow.nights + 1, (o) => o.night) > rules.maxNightsInRow.nights],
    ];
    for (const [rule, broken] of limits) {
      if (!broken || !on(rule)) continue;
      if (rules[rule].hard) return 'hard';
      soft = true;
    }
    return soft ? 'soft' : 'ok';
  };

  for (const s of order) {
    const fi = seatShift[s];
    const d = domains[s];
    let best = -1;
    let bestKey = Infinity;
    d.forEach((p, v) => {
      if (p === OPEN) return;
      const c = check(p, fi);
      if (c === 'hard') return;
      // below-contract people first; wishes and soft rule breaks move a person up or down
      const key = minutes[p] / 60 / Math.max(1, target[p]) - (wish.get(`${p}:${fi}`) ?? 0) * 0.05 + (c === 'soft' ? 1 : 0) + v * 1e-9;
      if (key < bestKey) {
        bestKey = key;
        best = v;
      }
    });
    if (best < 0) best = Math.max(0, d.indexOf(OPEN));
    x[s] = best;
    const p = d[best];
    if (p !== OPEN) {
      worked[p].push(fi);
      minutes[p] += facts[fi].minutes;
      onShift[fi].push(p);
    }
  }
  return x;
}
