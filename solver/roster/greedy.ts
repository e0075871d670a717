/**
 * A quick feasible-minded first roster to start the solver from (MapOptions.initial): seats
 * in two orders (below), each seat to the candidate who keeps every hard rule
 * so far and costs least by a rough local score (hours below contract first, wishes, soft
 * rules). Not optimal; it gives local search a roster that covers the seats instead of the
 * unary argmax, which on rosters with hard windows is often infeasible everywhere.
 */
import { absenceCredits, contractedTarget, creditHoursIn, dayStartMs, periodDays, rollingWindows } from '../../shared/roster/derive';
import { bestAux, OPEN, type CompiledRoster } from './compile';
import { averageWindowDays } from './rules/average-weekly-hours';
import { nightAllowance, nightWorkers } from './rules/night-average';
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
  const a = bestAux(compiled, greedyInOrder(compiled, constrained));
  const b = bestAux(compiled, greedyInOrder(compiled, timely));
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
  // per-person count terms the greedy keeps (hours, nights, shifts a week, weekends)
  const termsOf = roster.people.map((p) => p.terms.filter((t) => t.hard || t.weight > 0));
  const worked: number[][] = roster.people.map(() => []);
  const minutes = roster.people.map(() => 0);
  const onShift: number[][] = roster.shifts.map(() => []);
  const x = new Int32Array(domains.length);
  const credits = absenceCredits(roster);
  // credited absence counts as hours already worked when ranking who is furthest below contract
  roster.people.forEach((_, p) => (minutes[p] = creditHoursIn(credits, p, 0, days - 1) * 60));
  /** Days from a Monday to the period's first day, so (day + mondayOffset) % 7 = 0 on Mondays. */
  const mondayOffset = (new Date(`${roster.period.start}T12:00Z`).getUTCDay() + 6) % 7;
  const nightWorker = nightWorkers(roster, (id) => facts[shiftIdx.get(id)!].night);
  const restWindows = on('weeklyRest') ? rollingWindows(days, rules.weeklyRest.days).map((w) => ({ ...w, ws: dayStartMs(roster, w.first), we: dayStartMs(roster, w.last + 1) })) : [];
  const avgLen = averageWindowDays(rules.averageWeeklyHours, days);
  const nightLen = Math.min(days, rules.nightAverage.referenceDays ?? days);
  /** Would adding shift f leave person p without the weekly rest in some window? */
  const restBroken = (p: number, fi: number) => {
    const f = facts[fi];
    const H = rules.weeklyRest.hours * 3_600_000;
    // the person's shifts near f, sorted once (every window holding f lies within a window's length of it)
    let near: typeof facts | null = null;
    for (const w of restWindows) {
      if (w.we - w.ws < H || !(f.startMs < w.we && f.endMs > w.ws)) continue;
      if (!near) {
        const reach = (w.we - w.ws) * 2;
        near = [...worked[p], fi].map((k) => facts[k]).filter((o) => o.endMs > f.startMs - reach && o.startMs < f.endMs + reach).sort((a, b) => a.startMs - b.startMs);
      }
      const inside = near.filter((o) => o.startMs < w.we && o.endMs > w.ws);
      let cursor = w.ws;
      let longest = 0;
      for (const o of inside) {
        longest = Math.max(longest, o.startMs - cursor);
        cursor = Math.max(cursor, o.endMs);
      }
      if (Math.max(longest, w.we - cursor) < H) return true;
    }
    return false;
  };
  /** Largest window total (minutes + credited minutes) over windows of `len` days holding `day`, with `add` minutes on that day. */
  const windowHours = (p: number, day: number, len: number, addMinutes: number, withCredit: boolean) => {
    let most = 0;
    for (const w of windowsOf(len)) {
      if (day < w.first || day > w.last) continue;
      let t = addMinutes;
      for (let d = w.first; d <= w.last; d++) t += dayMinutes[p][d];
      most = Math.max(most, t / 60 + (withCredit ? creditHoursIn(credits, p, w.first, w.last) : 0) - limitOf(len, w.last - w.first + 1));
    }
    return most;
  };
  let limitOf = (_len: number, _n: number) => 0;
  const windowCache = new Map<number, ReturnType<typeof rollingWindows>>();
  const windowsOf = (len: number) => windowCache.get(len) ?? windowCache.set(len, rollingWindows(days, len)).get(len)!;

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

  // the rule checks of `check`, made once (closures per check were a fifth of the greedy's time);
  // they read the person, shift and fact being checked from here
  let p = 0, fi = 0, f = facts[0];
  const count = (len: number, arr: Float64Array[]) => windowMax(arr[p], f.day, len) + 1;
  // checked lazily, hard rules first: a hard breach ends the check, and once a soft one is found
  // the other soft rules cannot change the answer (this is most of the greedy's time on large
  // rosters: 200 people × 4 weeks, 1 M checks)
  const limits: [keyof typeof rules, () => boolean][] = [
    ['shiftsPerWindow', () => count(rules.shiftsPerWindow.days, dayShifts) > rules.shiftsPerWindow.maxShifts],
    ['maxConsecutiveDays', () => count(rules.maxConsecutiveDays.days + 1, dayShifts) > rules.maxConsecutiveDays.days],
    ['maxNightsInRow', () => f.night && count(rules.maxNightsInRow.nights + 1, dayNights) > rules.maxNightsInRow.nights],
    ['maxHoursPer7Days', () => {
      limitOf = () => rules.maxHoursPer7Days.hours;
      return windowHours(p, f.day, 7, f.minutes, true) > 1e-9;
    }],
    ['averageWeeklyHours', () => {
      limitOf = (_len, n) => (rules.averageWeeklyHours.hours * Math.max(7, n)) / 7;
      return windowHours(p, f.day, avgLen, f.minutes, true) > 1e-9;
    }],
    ['nightAverage', () => {
      limitOf = (_len, n) => nightAllowance(rules.nightAverage.hours, n);
      return nightWorker[p] && windowHours(p, f.day, nightLen, f.minutes, false) > 1e-9;
    }],
    ['weeklyRest', () => restBroken(p, fi)],
  ];
  /** Would p on shift f break a rule? 'hard' = never, 'soft' = only if nobody else. */
  const check = (person: number, shift: number): 'ok' | 'soft' | 'hard' => {
    p = person;
    fi = shift;
    f = facts[fi];
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
    for (const [rule, broken] of limits) if (on(rule) && rules[rule].hard && broken()) return 'hard';
    for (const t of termsOf[p]) {
      if (t.from !== undefined && f.date < t.from) continue;
      const mine = worked[p].map((k) => facts[k]).filter((o) => t.from === undefined || o.date >= t.from);
      let broken = false;
      if (t.kind === 'maxHours') broken = (mine.reduce((m, o) => m + o.minutes, 0) + f.minutes) / 60 > t.hours;
      else if (t.kind === 'maxNights') broken = f.night && mine.filter((o) => o.night).length + 1 > t.count;
      else if (t.kind === 'maxShiftsPerWeek') {
        const monday = f.day - ((f.day + mondayOffset) % 7);
        broken = mine.filter((o) => o.day >= monday && o.day < monday + 7).length + 1 > t.count;
      } else if (t.kind === 'maxWeekends' && f.weekend) {
        const key = (o: typeof f) => o.day - ((o.day + mondayOffset) % 7);
        const weeks = new Set(mine.filter((o) => o.weekend).map(key));
        broken = !weeks.has(key(f)) && weeks.size + 1 > t.count;
      }
      if (!broken) continue;
      if (t.hard) return 'hard';
      soft = true;
    }
    if (!soft) for (const [rule, broken] of limits) if (on(rule) && !rules[rule].hard && broken()) return 'soft';
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
