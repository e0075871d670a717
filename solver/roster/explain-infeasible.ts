/**
 * Reasons in words why a roster cannot have a roster meeting its hard rules, found before
 * solving by necessary conditions: a seat nobody may fill, a shift whose seats cannot all
 * be filled at once (bipartite matching), more seats in a rest window than the people with
 * the skill may work, a hard skill mix nobody can meet, and pins that break hard rules.
 * An empty list means none of these checks failed, not that a feasible roster exists.
 */
import { absenceBlocks, contractedTarget, describeShift, fairShares, formatDay, formatHours, periodDays, rollingWindows, shiftFacts, type ShiftFacts } from '../../shared/roster/derive';
import { TERMS, TERM_WORDS } from './rules';
import type { Roster } from '../../shared/roster/schema';
import { addLocalDays } from '../../shared/roster/time';

/** Largest matching of seats to people (augmenting paths); seats × people is small per shift. */
function maxMatching(options: number[][]): number {
  const owner = new Map<number, number>();
  const tryAssign = (s: number, seen: Set<number>): boolean => {
    for (const p of options[s]) {
      if (seen.has(p)) continue;
      seen.add(p);
      const o = owner.get(p);
      if (o === undefined || tryAssign(o, seen)) {
        owner.set(p, s);
        return true;
      }
    }
    return false;
  };
  let m = 0;
  for (let s = 0; s < options.length; s++) if (tryAssign(s, new Set())) m++;
  return m;
}

function listNames(names: string[], max = 4): string {
  if (names.length <= max) return names.join(', ');
  return `${names.slice(0, max).join(', ')} and ${names.length - max} more`;
}

export function explainInfeasible(roster: Roster): string[] {
  const reasons: string[] = [];
  const rules = roster.rules;
  const facts = shiftFacts(roster);
  const days = periodDays(roster);
  const shiftIdx = new Map(roster.shifts.map((s, i) => [s.id, i]));
  const personIdx = new Map(roster.people.map((p, i) => [p.id, i]));
  const seatIdx = new Map(roster.seats.map((s, i) => [s.id, i]));
  const seatShift = roster.seats.map((s) => shiftIdx.get(s.shift)!);
  const seatsOfShift: number[][] = roster.shifts.map(() => []);
  seatShift.forEach((sh, s) => seatsOfShift[sh].push(s));
  const skillName = new Map(roster.skills.map((k) => [k.id, k.name]));
  const sk = (id: string) => skillName.get(id) ?? id;
  const coverageHard = rules.coverage.enabled && rules.coverage.hard;
  const longNightHard = (f: ShiftFacts) => rules.nightShiftLength.enabled && rules.nightShiftLength.hard && f.night && f.minutes > rules.nightShiftLength.hours * 60;
  const pinOf = new Map(roster.pins.map((p) => [seatIdx.get(p.seat)!, p.person === null ? -1 : personIdx.get(p.person)!]));

  const cannot = new Map<number, Set<number>>(); // shift → people who cannot
  for (const w of roster.wishes) {
    if (w.kind !== 'cannot') continue;
    const p = personIdx.get(w.person)!;
    const shifts = w.shift !== undefined ? [shiftIdx.get(w.shift)!] : facts.filter((f) => f.date === w.date).map((f) => f.index);
    for (const sh of shifts) {
      if (!cannot.has(sh)) cannot.set(sh, new Set());
      cannot.get(sh)!.add(p);
    }
  }
  const away = absenceBlocks(roster, facts);
  /** Why person p may not work shift f by an absence or a hard shift-level term, in words (null = they may). */
  const personBar = (p: number, f: ShiftFacts): { kind: string; words: string } | null => {
    const a = away.get(p)?.get(f.index);
    if (a) return { kind: `absence:${a.kind}`, words: a.kind === 'annual' ? 'on annual leave' : a.kind === 'sick' ? 'off sick' : a.kind === 'training' ? 'on training' : a.kind === 'parental' ? 'on parental leave' : 'away' };
    for (const t of roster.people[p].terms) {
      const m = TERMS[t.kind];
      if (!t.hard || !m.breaksShift) continue;
      if ((m.breaksShift as (t: unknown, f: ShiftFacts, r: Roster) => boolean)(t, f, roster)) return { kind: `term:${t.kind}`, words: `on ${TERM_WORDS[t.kind].name.toLowerCase()} terms` };
    }
    return null;
  };
  const skilled = (s: number) => {
    const need = roster.seats[s].skill;
    const out: number[] = [];
    roster.people.forEach((p, i) => {
      if (need === null || p.skills.includes(need)) out.push(i);
    });
    return out;
  };
  /** People who may sit in seat s by the unary hard rules. */
  const available = (s: number) => {
    const f = facts[seatShift[s]];
    if (longNightHard(f)) return [];
    const pin = pinOf.get(s);
    if (pin !== undefined) return pin >= 0 && !cannot.get(f.index)?.has(pin) && !personBar(pin, f) ? [pin] : [];
    return skilled(s).filter((p) => !cannot.get(f.index)?.has(p) && !personBar(p, f));
  };

  /**
   * "Nobody can take the Night lead seat on the night shift on Fri 12 Mar: Imogen Thistlewood is
   * on annual leave and the other night leads are on no nights terms": each holder of the
   * skill with why they may not, grouped by reason.
   */
  const nobodyFor = (s: number, f: ShiftFacts): string => {
    const need = roster.seats[s].skill;
    const holders = skilled(s);
    const what = `${need === null ? 'a' : `the ${sk(need)}`} seat on ${describeShift(f)}`;
    if (!holders.length) return `Nobody can take ${what}: nobody has ${sk(need!)}`;
    const groups = new Map<string, { words: string; people: string[] }>();
    for (const p of holders) {
      const bar = personBar(p, f);
      const g = bar ?? { kind: 'wish', words: 'cannot (their wish)' };
      const key = bar ? bar.kind : 'wish';
      if (!groups.has(key)) groups.set(key, { words: g.words, people: [] });
      groups.get(key)!.people.push(roster.people[p].name);
    }
    const parts = [...groups.values()];
    const group = need === null ? 'everyone else' : `the other ${holders.length - (parts[0]?.people.length ?? 0) === 1 ? 'holder' : 'holders'} of ${sk(need)}`;
    const phrase = (g: { words: string; people: string[] }, i: number) => {
      const names = i > 0 && parts.length === 2 && g.people.length > 2 ? group : listNames(g.people).replace(/, ([^,]+)$/, ' and $1');
      const verb = g.words.startsWith('cannot') ? '' : g.people.length === 1 && !(i > 0 && names === group) ? 'is ' : 'are ';
      return `${names} ${verb}${g.words}`;
    };
    return `Nobody can take ${what}: ${parts.map(phrase).join(parts.length === 2 ? ' and ' : '; ')}`;
  };

  // pins against hard rules
  for (const [s, p] of pinOf) {
    const f = facts[seatShift[s]];
    if (p < 0) {
      if (coverageHard) reasons.push(`a seat on ${describeShift(f)} is pinned open but coverage is hard`);
      continue;
    }
    const name = roster.people[p].name;
    if (cannot.get(f.index)?.has(p)) reasons.push(`${name} is pinned to ${describeShift(f)} but cannot work it`);
    const bar = personBar(p, f);
    if (bar) reasons.push(`${name} is pinned to ${describeShift(f)} but is ${bar.words}`);
    if (longNightHard(f)) reasons.push(`${name} is pinned to ${describeShift(f)}, a ${formatHours(f.hours)} night, but nights are limited to ${formatHours(rules.nightShiftLength.hours)} (hard)`);
  }
  const pinsByPerson = new Map<number, number[]>();
  for (const [s, p] of pinOf) if (p >= 0) pinsByPerson.set(p, [...(pinsByPerson.get(p) ?? []), s]);
  for (const [p, seats] of pinsByPerson) {
    for (let i = 0; i < seats.length; i++)
      for (let j = i + 1; j < seats.length; j++) {
        const a = facts[seatShift[seats[i]]];
        const b = facts[seatShift[seats[j]]];
        const [x, y] = a.startMs <= b.startMs ? [a, b] : [b, a];
        if (y.startMs < x.endMs) reasons.push(`${roster.people[p].name} is pinned to ${x.index === y.index ? `two seats on ${describeShift(x)}` : `${describeShift(x)} and ${describeShift(y)}, which overlap`}`);
        else if (rules.minRest.enabled && rules.minRest.hard && y.startMs - x.endMs < rules.minRest.hours * 3_600_000)
          reasons.push(`${roster.people[p].name} is pinned to ${describeShift(x)} and ${describeShift(y)}, with ${formatHours(Math.round((y.startMs - x.endMs) / 60_000) / 60)} rest; minimum ${formatHours(rules.minRest.hours)} (hard)`);
      }
  }
  for (const pr of roster.pairings) {
    if (!pr.never) continue;
    const a = personIdx.get(pr.a)!;
    const b = personIdx.get(pr.b)!;
    for (const sa of pinsByPerson.get(a) ?? [])
      for (const sb of pinsByPerson.get(b) ?? [])
        if (seatShift[sa] === seatShift[sb]) reasons.push(`${roster.people[a].name} and ${roster.people[b].name} are both pinned to ${describeShift(facts[seatShift[sa]])} but must never share a shift`);
  }

  // every seat must be fillable, and each shift's seats at once
  if (coverageHard) {
    for (const f of facts) {
      const seats = seatsOfShift[f.index];
      if (!seats.length) continue;
      const opts = seats.map(available);
      let seatProblem = false;
      seats.forEach((s, k) => {
        if (opts[k].length || pinOf.get(s) !== undefined) return;
        seatProblem = true;
        const need = roster.seats[s].skill;
        if (longNightHard(f)) {
          reasons.push(`${describeShift(f)} is ${formatHours(f.hours)}, longer than the hard ${formatHours(rules.nightShiftLength.hours)} night limit, so nobody may work it, and coverage is hard`);
          return;
        }
        reasons.push(nobodyFor(s, f));
      });
      if (seatProblem) continue;
      const m = maxMatching(opts);
      if (m < seats.length) {
        const skills = seats.map((s) => roster.seats[s].skill).filter((x): x is string => x !== null);
        const people = new Set(opts.flat());
        reasons.push(
          `${describeShift(f)} has ${seats.length} seats${skills.length ? ` (${skills.map(sk).join(', ')})` : ''} and only ${m} can be filled at once from the ${people.size} people available`,
        );
      }
    }
  }

  // rest windows: seats needing a skill in a window against what its holders may work
  if (coverageHard && rules.shiftsPerWindow.enabled && rules.shiftsPerWindow.hard) {
    const skillsUsed = new Set<string | null>([null, ...roster.seats.map((s) => s.skill)]);
    for (const skill of skillsUsed) {
      const holders = roster.people.filter((p) => skill === null || p.skills.includes(skill));
      for (const w of rollingWindows(days, rules.shiftsPerWindow.days)) {
        const need = roster.seats.filter((seat, s) => {
          const f = facts[seatShift[s]];
          // a skill-less window counts every seat: anyone must fill those
          return f.day >= w.first && f.day <= w.last && (skill === null || seat.skill === skill);
        }).length;
        const cap = holders.length * rules.shiftsPerWindow.maxShifts;
        if (need > cap) {
          const who = skill === null ? 'the team' : `the ${holders.length} ${holders.length === 1 ? 'person' : 'people'} with ${sk(skill)}`;
          reasons.push(
            `${formatDay(addLocalDays(roster.period.start, w.first))}–${formatDay(addLocalDays(roster.period.start, w.last))} has ${need} ${skill === null ? '' : `${sk(skill)} `}seats; ${who} may work at most ${cap} (${rules.shiftsPerWindow.maxShifts} shifts in ${rules.shiftsPerWindow.days} days each, hard)`,
          );
          break; // one window per skill is enough to say it
        }
      }
    }
  }

  // hard skill mix
  if (rules.skillMix.enabled && rules.skillMix.hard) {
    for (const q of rules.skillMix.requirements) {
      for (const f of facts) {
        if (q.patternLabel !== undefined && f.patternLabel !== q.patternLabel) continue;
        const holders = new Set<number>();
        for (const s of seatsOfShift[f.index]) for (const p of available(s)) if (roster.people[p].skills.includes(q.skill)) holders.add(p);
        if (holders.size < q.min) reasons.push(`${describeShift(f)} needs ${q.min} with ${sk(q.skill)} (hard); only ${holders.size} can be on it`);
      }
    }
  }

  // hard contracted hours: the most a person could work
  if (rules.contractedHours.enabled && rules.contractedHours.hard) {
    roster.people.forEach((person, p) => {
      const target = contractedTarget(person, days);
      if (target === undefined) return;
      const shifts = new Set<number>();
      roster.seats.forEach((_, s) => {
        if (available(s).includes(p)) shifts.add(seatShift[s]);
      });
      const most = [...shifts].reduce((m, sh) => m + facts[sh].minutes, 0) / 60;
      if (most < target - rules.contractedHours.toleranceHours)
        reasons.push(`${person.name} can work at most ${formatHours(most)} but is contracted for ${formatHours(target)} (± ${formatHours(rules.contractedHours.toleranceHours)}, hard)`);
    });
  }

  // hard fair shares below what must be worked
  for (const [term, pick, noun] of [['fairNights', (f: ShiftFacts) => f.night, 'night'], ['fairWeekends', (f: ShiftFacts) => f.weekend, 'weekend']] as const) {
    if (!coverageHard || !rules[term].enabled || !rules[term].hard) continue;
    const shares = fairShares(roster, facts, pick);
    const seats = roster.seats.filter((_, s) => pick(facts[seatShift[s]])).length;
    const cap = [...shares.values()].reduce((a, b) => a + b, 0);
    if (seats > cap) reasons.push(`${seats} ${noun} seats but fair shares (hard) allow only ${cap}`);
  }
  return reasons;
}
