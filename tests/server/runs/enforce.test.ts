/**
 * "What would it cost to honour this?" for per-person concessions (issue 12): the enforced roster
 * must allow exactly the rosters where that concession is not given up. Checked by enumerating
 * every filling of a small roster (scoreRoster): the enforced roster's feasible fillings are the
 * original's fillings without that person's violation of that term.
 */
import { describe, expect, it } from 'vitest';
import { rosterSchema, type Roster, type RosterAssignment } from '../../../shared/roster/schema';
import { scoreRoster } from '../../../solver/roster/score-roster';
import { enforce, type StoredViolation } from '../../../server/runs/concession-price';
import { days, roster } from '../../solver/roster/rule-helpers';

function* fillings(r: Roster): Generator<RosterAssignment> {
  const options = [null, ...r.people.map((p) => p.id)];
  const digits = new Array(r.seats.length).fill(0);
  for (;;) {
    yield Object.fromEntries(r.seats.map((s, i) => [s.id, options[digits[i]]]));
    let i = 0;
    while (i < digits.length && ++digits[i] === options.length) digits[i++] = 0;
    if (i === digits.length) return;
  }
}

const violationOf = (r: Roster, term: string, person: string): StoredViolation => {
  for (const a of fillings(r)) {
    const v = scoreRoster(r, a).violations.find((x) => x.term === term && x.people.includes(person) && !x.hard);
    if (v) return { ...v, points: v.points ?? null };
  }
  throw new Error(`no filling breaks ${term} for ${person}`);
};

/** Every filling feasible in `enforced` is one where `person` keeps `term` in the original, and back. */
function expectExact(original: Roster, enforced: Roster, term: string, person: string) {
  let kept = 0;
  for (const a of fillings(original)) {
    const before = scoreRoster(original, a);
    if (!before.feasible) continue;
    const breaks = before.violations.some((x) => x.term === term && x.people.includes(person));
    const after = scoreRoster(enforced, a);
    expect(after.feasible).toBe(!breaks);
    if (!breaks) kept++;
  }
  expect(kept).toBeGreaterThan(0);
}

describe('enforce: per-person concessions made hard for that person only', () => {
  const shifts = days(4, '07:00', '15:00');
  const base = (rules: Parameters<typeof roster>[1], terms: Roster['people'][number]['terms'] = []) => {
    const r = roster(shifts, rules, { period: { start: '2027-01-04', end: '2027-01-07', timeZone: 'Europe/London' } });
    return rosterSchema.parse({ ...r, people: r.people.map((p) => ({ ...p, contractedHoursPerWeek: 28, terms: p.id === 'ada' ? terms : [] })) });
  };

  it("a soft term of the person's becomes hard", () => {
    const r = base({}, [{ kind: 'maxShiftsPerWeek', count: 2, hard: false, weight: 3 }]);
    const out = enforce(r, violationOf(r, 'maxShiftsPerWeek', 'ada'));
    expect(out.exact).toBe(true);
    expect(out.enforced).toMatch(/^Ada Brook's term .* made hard$/);
    expectExact(r, out.roster, 'maxShiftsPerWeek', 'ada');
  });

  it('contracted hours: 28 h/week over 4 days is 16 h, ± 8 h tolerance → 8–24 h for Ada alone', () => {
    const r = base({ contractedHours: { weight: 1, toleranceHours: 8 } });
    const out = enforce(r, violationOf(r, 'contractedHours', 'ada'));
    expect(out.exact).toBe(true);
    expect(out.enforced).toContain('8–24 h');
    expectExact(r, out.roster, 'contractedHours', 'ada');
    // Ben is untouched
    expect(out.roster.people.find((p) => p.id === 'ben')!.terms).toEqual([]);
  });

  it('a rule with no per-person form is made hard for everyone, and the words say so', () => {
    const r = base({ maxConsecutiveDays: { days: 2, hard: false, weight: 1 } });
    const out = enforce(r, violationOf(r, 'maxConsecutiveDays', 'ada'));
    expect(out.exact).toBe(false);
    expect(out.enforced).toMatch(/for everyone/);
    expect(out.roster.rules.maxConsecutiveDays.hard).toBe(true);
  });
});
