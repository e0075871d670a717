import { describe, expect, it } from 'vitest';
import { makeWillowmereRoster } from '../../../shared/demo/willowmere';
import { makeRoster } from '../../../shared/demo/make-roster';
import { rosterSchema, type Roster } from '../../../shared/roster/schema';
import { compileRoster, OPEN } from '../../../solver/roster/compile';
import { decodeAssignment, encodeAssignment } from '../../../solver/roster/decode';
import { explainInfeasible } from '../../../solver/roster/explain-infeasible';
import { greedyAssignment } from '../../../solver/roster/greedy';
import { scoreRoster } from '../../../solver/roster/score-roster';
import { score, validateModel } from '../../../solver/model';

describe('compileRoster', () => {
  const demo = makeWillowmereRoster();
  const c = compileRoster(demo);

  it('makes a valid model: one variable per seat, values = eligible people + open, keys = person index / -1', () => {
    validateModel(c.model);
    // seats first, then one auxiliary variable per (person, 7-day window) of the weekly rest (Art. 5)
    expect(c.model.variables).toHaveLength(demo.seats.length + c.aux.length);
    expect(c.aux.every((a, k) => a.v === demo.seats.length + k && a.term === 'weeklyRest')).toBe(true);
    demo.seats.forEach((seat, s) => {
      const v = c.model.variables[s];
      expect(c.seatIndex.get(seat.id)).toBe(s);
      expect(Array.from(v.keys!)).toEqual(c.domains[s]);
      expect(c.domains[s][c.domains[s].length - 1]).toBe(OPEN);
      for (const p of c.domains[s]) if (p !== OPEN && seat.skill) expect(demo.people[p].skills).toContain(seat.skill);
    });
    // nobody with the skill is left out (except for a cannot wish)
    const nightLeadSeat = demo.seats.findIndex((s) => s.skill === 'night-lead');
    expect(c.domains[nightLeadSeat].filter((p) => p !== OPEN).map((p) => demo.people[p].id).sort()).toEqual(['delphine', 'imogen', 'tobias']);
  });

  it('uses structured and counting factors only, never dense pairwise tables', () => {
    const kinds = new Set(c.model.factors.map((f) => f.kind));
    expect(kinds.has('pairwise')).toBe(false);
    expect(kinds.has('table')).toBe(false);
    expect([...kinds].sort()).toEqual(['allDifferent', 'counting', 'unary']);
    // soft rest uses sameKey (Potts over people)
    const soft = compileRoster(makeWillowmereRoster({ rules: { minRest: { hard: false } } }));
    expect(soft.model.factors.some((f) => f.kind === 'sameKey' && f.id?.startsWith('minRest:'))).toBe(true);
  });

  it('removes people with a cannot wish from the seats of that day', () => {
    const saoirse = demo.people.findIndex((p) => p.id === 'saoirse');
    const w = demo.wishes.find((x) => x.person === 'saoirse' && x.kind === 'cannot')!;
    demo.seats.forEach((seat, s) => {
      const shift = demo.shifts.find((sh) => sh.id === seat.shift)!;
      if (shift.start.startsWith(w.date!) && seat.skill === null) expect(c.domains[s]).not.toContain(saoirse);
    });
  });

  it('hard coverage removes open; a pin leaves one value', () => {
    const r = makeWillowmereRoster({ rules: { coverage: { hard: true } }, pins: [{ seat: 'night-2027-01-05-1', person: 'imogen' }] });
    const h = compileRoster(r);
    expect(h.domains.slice(0, r.seats.length).every((d) => !d.includes(OPEN))).toBe(true);
    expect(h.domains[h.seatIndex.get('night-2027-01-05-1')!]).toEqual([r.people.findIndex((p) => p.id === 'imogen')]);
  });

  it('keeps counting tables short on large rosters (hard weekly limits cap every sum)', () => {
    const big = compileRoster(makeRoster({ people: 20, weeks: 13 }));
    const longest = Math.max(...big.model.factors.map((f) => (f.kind === 'counting' && typeof f.score !== 'function' ? f.score.length : 0)));
    // This fixture spans the spring DST change (a 7 h night), so hours count in 1 h units; a
    // person's sum over 13 weeks is capped by the 48 h average (Art. 6 with Art. 16(b), over the
    // period: 48 × 91 / 7 = 624 h): 0..624 allowed plus one -Infinity entry, not one entry per
    // hour of every seat they could take (13 × 7 × 27 seats × 8 h).
    expect(big.minuteUnit).toBe(60);
    expect(longest).toBeLessThanOrEqual(13 * 48 + 2);
  });

  it('a hard "at most 6 shifts in 7 days" (local policy) stops its table at 8 entries', () => {
    const r = makeRoster({ people: 20, weeks: 4 });
    const c = compileRoster({ ...r, rules: { ...r.rules, shiftsPerWindow: { ...r.rules.shiftsPerWindow, enabled: true } } });
    const weekly = c.model.factors.filter((f) => f.kind === 'counting' && f.id?.startsWith('shiftsPerWindow'));
    expect(weekly.length).toBeGreaterThan(0);
    // 0..6 allowed, then -Infinity repeated
    for (const f of weekly) expect(f.kind === 'counting' && Array.from(f.score as ArrayLike<number>)).toEqual([0, 0, 0, 0, 0, 0, 0, -Infinity]);
  });
});

describe('decodeAssignment / encodeAssignment', () => {
  it('reports who works where, open seats, and per-person hours, nights and weekend shifts', () => {
    const r = makeRoster({ people: 6, weeks: 1, seed: 3 });
    const c = compileRoster(r);
    // everyone's first eligible person
    const x = c.domains.map(() => 0);
    const d = decodeAssignment(c, x);
    expect(d.seats).toHaveLength(r.seats.length);
    const worked = d.seats.filter((s) => s.personId !== null);
    for (const p of d.people) {
      const mine = worked.filter((s) => s.personId === p.personId);
      expect(p.shifts).toBe(mine.length);
      expect(p.hours).toBe(mine.length * 8); // every fixture shift is 8 h (no DST in January)
      expect(p.nights).toBe(mine.filter((s) => s.patternLabel === 'night').length);
      expect(p.weekendShifts).toBe(mine.filter((s) => ['2027-01-09', '2027-01-10'].includes(s.date)).length);
    }
    expect(d.openSeats.map((s) => s.seatId)).toEqual(d.seats.filter((s) => s.personId === null).map((s) => s.seatId));
    const enc = encodeAssignment(c, d.assignment);
    expect(enc.ok && Array.from(enc.values)).toEqual(x);
  });

  it('refuses to encode someone outside the seat’s domain, naming the seat', () => {
    const r = makeRoster({ people: 6, weeks: 1 });
    const c = compileRoster(r);
    const seat = r.seats.find((s) => s.skill === 'night-lead')!;
    const lacking = r.people.find((p) => !p.skills.includes('night-lead'))!;
    expect(encodeAssignment(c, { [seat.id]: lacking.id })).toEqual({ ok: false, seats: [seat.id] });
  });
});

describe('explainInfeasible', () => {
  const base = () => makeWillowmereRoster({ rules: { coverage: { hard: true } } });
  const withWishes = (r: Roster, wishes: Roster['wishes']) => rosterSchema.parse({ ...r, wishes: [...r.wishes, ...wishes] });

  it('finds nothing to say about the demo', () => {
    expect(explainInfeasible(base())).toEqual([]);
  });

  it('says when nobody with a needed skill is available', () => {
    const r = withWishes(base(), ['imogen', 'tobias', 'delphine'].map((person) => ({ person, date: '2027-01-12', kind: 'cannot' as const, strength: 1 })));
    const reasons = explainInfeasible(r);
    expect(reasons).toContain('Nobody can take the Night lead seat on the night shift on Tue 12 Jan: Imogen Thistlewood, Tobias Marchbank and Delphine Ashcombe cannot (their wish)');
    // and the model agrees: no assignment scores above -Infinity (the seat has only the impossible open value)
    const c = compileRoster(r);
    const s = c.seatIndex.get('night-2027-01-12-1')!;
    expect(c.domains[s]).toEqual([OPEN]);
    expect(score(c.model, c.domains.map(() => 0))).toBe(-Infinity);
  });

  it('says when a shift’s seats cannot all be filled at once', () => {
    // only 3 people may work the early on Mon 4 Jan, which has 4 seats
    const names = makeWillowmereRoster().people.map((p) => p.id);
    const r = withWishes(base(), names.slice(3).map((person) => ({ person, shift: 'early-2027-01-04', kind: 'cannot' as const, strength: 1 })));
    expect(explainInfeasible(r)).toContainEqual(expect.stringContaining('the early shift on Mon 4 Jan has 4 seats'));
  });

  it('says when a rest window has more skilled seats than the skill holders may work', () => {
    // 7 night-lead seats a week, and only one night lead who may work 6 shifts in 7 days (local policy on, hard)
    const r0 = base();
    const r = rosterSchema.parse({ ...r0, rules: { ...r0.rules, shiftsPerWindow: { ...r0.rules.shiftsPerWindow, enabled: true, hard: true } }, people: r0.people.map((p) => (p.id === 'tobias' || p.id === 'delphine' ? { ...p, skills: p.skills.filter((s) => s !== 'night-lead') } : p)) });
    expect(explainInfeasible(r)).toContainEqual(expect.stringMatching(/^Mon 4 Jan–Sun 10 Jan has 7 Night lead seats; the 1 person with Night lead may work at most 6/));
  });

  it('says when pins break hard rules', () => {
    const r = rosterSchema.parse({
      ...base(),
      pins: [
        { seat: 'late-2027-01-04-1', person: 'priya' },
        { seat: 'early-2027-01-05-1', person: 'priya' },
      ],
    });
    expect(explainInfeasible(r)).toEqual([
      'Priya Hollinshead is pinned to the late shift on Mon 4 Jan and the early shift on Tue 5 Jan, with 8 h rest; minimum 11 h (hard)',
    ]);
  });
});

describe('greedyAssignment (the solver’s starting roster)', () => {
  it.each([
    ['demo', () => makeWillowmereRoster()],
    ['demo with consecutive days and nights in a row hard', () => makeWillowmereRoster({ rules: { maxConsecutiveDays: { hard: true }, maxNightsInRow: { hard: true } } })],
    ['fixture 30 × 6', () => makeRoster({ people: 30, weeks: 6, seed: 4 })],
  ])('%s: keeps every hard rule and fills nearly every seat', (_, make) => {
    const r = make();
    const c = compileRoster(r);
    const d = decodeAssignment(c, greedyAssignment(c));
    const s = scoreRoster(r, d.assignment);
    expect(s.violations.filter((v) => v.hard)).toEqual([]);
    expect(d.openSeats.length).toBeLessThanOrEqual(r.seats.length * 0.02);
  });
});
