/**
 * A quick feasible-minded first roster to start the solver from (MapOptions.initial): seats
 * in two orders (below), each seat to the candidate who keeps every hard rule
 * so far and costs least by a rough local score (hours below contract first, wishes, soft
 * rules). Not optimal; it gives local search a roster that covers the seats instead of the
 * unary argmax, which on rosters with hard windows is often infeasible everywhere.
 */
import { contractedTarget, periodDays } from '../../shared/roster/derive';
import { OPEN, type CompiledRoster } from './compile';
import { score } from '../model/score';

export function greedyAssignment(compiled: CompiledRoster): Int32Array {
  const { roster, facts, domains } = compiled;
  const shiftIdx = new Map(roster.shifts.map((s, i) => [s.id, i]));
  const start = (s: number) => facts[shiftIdx.get(roster.seats[s].shift)!].startMs;
  const seats = roster.seats.map((_, s) => s);
  // Most constrained seats first (three night leads for every night-lead seat), then by time;
  // and plain time order. Neither wins everywhere (in time order the night leads get used on
  // day shifts and the first night stays open), so both run and the better one is kept.
  const constrained = [...seats].sort((a, b) => domains[a].length - domains[b].length || start(a) - start(b) || a - b);
  const timely = [...seats].sort((a, b) => start(a) - start(b) || domains[a].length - domains[b].length || a - b);
  const a = greedyInOrder(compiled, constrained);
  const b = greedyInOrder(compiled, timely);
  return score(compiled.model, a) >= score(compiled.model, b) ? a : b;
}

function greedyInOrder(compiled: CompiledRoster, order: number[]): Int32Array {
  const { roster, facts, domains } = compiled;
  const rules = roster.rules;
  const on = (t: keyof typeof rules) => rules[t].enabled && (rules[t].hard || rules[t].weight > 0);
  const days = periodDays(roster);
  const shiftIdx = new Map(roster.shifts.map((s, i) => [s.id, i]));
  const personIdx = new Map(roster.people.map((p, i) => [p.id, i]));
  const seatShift = roster.seats.map((s) => shiftIdx.get(s.shift)!);
  const wish = new Map<number, number>();
  const nShifts = roster.shifts.length;
  for (const w of roster.wishes) {
    if (w.kind === 'cannot') continue;
    const p = personIdx.get(w.person)!;
    for (const f of facts) if (w.shift === f.id || w.date === f.date) wish.set(p * nShifts + f.index, (wish.get(p * nShifts + f.index) ?? 0) + (w.kind === 'prefer' ? w.strength : -w.strength));
  }
  const never = new Set(roster.pairings.filter((p) => p.never).flatMap((p) => [`${personIdx.get(p.a)}:${personIdx.get(p.b)}`, `${personIdx.get(p.b)}:${personIdx.get(p.a)}`]));
  const target = roster.people.map((p) => contractedTarget(p, days) ?? (days / 7) * 30);
  const worked: number[][] = roster.people.map(() => []);
  const minutes = roster.people.map(() => 0);
  const onShift: number[][] = roster.shifts.map(() => []);
  const x = new Int32Array(domains.length);

  // per person and day: shifts, nights and minutes worked, for the window checks
  const perDay = () => roster.people.map(() => new Float64Array(days + 1));
  const dayShifts = perDay();
  const dayNights = perDay();
  const dayMinutes = perDay();
  /** Largest total of arr over the windows of `len` days that hold `day` (sliding sum, O(len)). */
  const windowMax = (arr: Float64Array, day: number, len: number) => {
    const first = Math.max(0, day - len + 1);
    let t = 0;
    for (let d = first; d < first + len && d < days; d++) t += arr[d];
    let most = t;
    for (let f0 = first + 1; f0 <= day; f0++) {
      t += (f0 + len - 1 < days ? arr[f0 + len - 1] : 0) - arr[f0 - 1];
      if (t > most) most = t;
    }
    return most;
  };

  /** Would p on shift f break a rule? 'hard' = never, 'soft' = only if nobody else. */
  const check = (p: number, fi: number): 'ok' | 'soft' | 'hard' => {
    const f = facts[fi];
    let soft = false;
    for (const k of worked[p]) {
      const o = facts[k];
      if (o.startMs < f.endMs && f.startMs < o.endMs) return 'hard';
      const gap = Math.min(Math.abs(f.startMs - o.endMs), Math.abs(o.startMs - f.endMs));
      if (on('minRest') && gap < rules.minRest.hours * 3_600_000) {
        if (rules.minRest.hard) return 'hard';
        soft = true;
      }
    }
    if (never.size) for (const q of onShift[fi]) if (never.has(`${p}:${q}`)) return 'hard';
    // seats are not filled in time order, so every window holding f.day is checked
    const count = (len: number, arr: Float64Array[]) => windowMax(arr[p], f.day, len) + 1;
    const limits: [keyof typeof rules, boolean][] = [
      ['weeklyRest', count(rules.weeklyRest.days, dayShifts) > rules.weeklyRest.maxShifts],
      ['maxHoursPer7Days', windowMax(dayMinutes[p], f.day, 7) + f.minutes > rules.maxHoursPer7Days.hours * 60],
      ['maxConsecutiveDays', count(rules.maxConsecutiveDays.days + 1, dayShifts) > rules.maxConsecutiveDays.days],
      ['maxNightsInRow', f.night && count(rules.maxNightsInRow.nights + 1, dayNights) > rules.maxNightsInRow.nights],
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
      const key = minutes[p] / 60 / Math.max(1, target[p]) - (wish.get(p * nShifts + fi) ?? 0) * 0.05 + (c === 'soft' ? 10 : 0) + v * 1e-9;
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
      const f = facts[fi];
      dayShifts[p][f.day]++;
      dayMinutes[p][f.day] += f.minutes;
      if (f.night) dayNights[p][f.day]++;
    }
  }
  return x;
}
