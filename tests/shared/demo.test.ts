import { describe, expect, it } from 'vitest';
import { makeWillowmereRoster } from '../../shared/demo/willowmere';
import { makeRoster } from '../../shared/demo/make-roster';
import { isoWeekday } from '../../shared/roster/time';
import { RULE_NAMES } from '../../shared/roster/schema';
import { greedyRoster, openCount } from '../solver/roster/helpers';
import { scoreRoster } from '../../solver/roster/score-roster';
import { explainInfeasible } from '../../solver/roster/explain-infeasible';

describe('Willowmere House demo', () => {
  const demo = makeWillowmereRoster();

  it('has the shape DESIGN.md describes', () => {
    expect(demo.people).toHaveLength(18);
    expect(new Set(demo.people.map((p) => p.name)).size).toBe(18);
    expect(demo.skills.map((s) => s.name)).toEqual(['Medication round', 'First aid', 'Night lead']);
    expect(new Set(demo.shifts.map((s) => s.patternLabel))).toEqual(new Set(['early', 'late', 'night']));
    expect(isoWeekday(demo.period.start)).toBe(1);
    expect(demo.period).toMatchObject({ start: '2027-01-04', end: '2027-01-31', timeZone: 'Europe/London' });
    expect(demo.shifts).toHaveLength(28 * 3);
    expect(demo.seats.length).toBeGreaterThan(240);
    expect(demo.pairings.some((p) => p.score > 0)).toBe(true);
    expect(demo.pairings.some((p) => p.score < 0 || p.never)).toBe(true);
    expect(new Set(demo.wishes.map((w) => w.person)).size).toBeGreaterThanOrEqual(4);
    // every rule on except the two local policies, which are off by default
    for (const r of RULE_NAMES) expect(demo.rules[r].enabled).toBe(r !== 'shiftsPerWindow' && r !== 'maxHoursPer7Days');
    // issue 12: leave, a sick day and a training day; a no-nights term and fixed days off
    expect(demo.absences.map((a) => a.kind).sort()).toEqual(['annual', 'sick', 'training']);
    expect(demo.people.filter((p) => p.terms.length).map((p) => p.terms[0].kind).sort()).toEqual(['daysOff', 'noNights']);
  });

  it('is feasible with every rule on: a greedy roster fills every seat and breaks no hard rule', () => {
    const a = greedyRoster(demo);
    expect(openCount(a)).toBe(0);
    const s = scoreRoster(demo, a);
    expect(s.violations.filter((v) => v.hard)).toEqual([]);
    expect(s.feasible).toBe(true);
    expect(explainInfeasible(makeWillowmereRoster({ rules: { coverage: { hard: true } } }))).toEqual([]);
  });

  it('takes overrides: fewer weeks drops wishes outside the period; rules merge per rule', () => {
    const two = makeWillowmereRoster({ weeks: 2, rules: { minRest: { hours: 12 } } });
    expect(two.shifts).toHaveLength(14 * 3);
    expect(two.wishes.every((w) => (w.date ?? w.shift!.slice(-10)) <= two.period.end)).toBe(true);
    expect(two.rules.minRest).toMatchObject({ hours: 12, hard: true, enabled: true });
    expect(two.rules.skillMix.requirements).toHaveLength(1);
  });
});

describe('makeRoster fixtures', () => {
  it('is deterministic for a seed and varies with it', () => {
    expect(makeRoster({ people: 10, weeks: 1, seed: 4 })).toEqual(makeRoster({ people: 10, weeks: 1, seed: 4 }));
    expect(makeRoster({ people: 10, weeks: 1, seed: 4 }).wishes).not.toEqual(makeRoster({ people: 10, weeks: 1, seed: 5 }).wishes);
  });

  it.each([
    [6, 1],
    [60, 13],
  ])('%i people × %i weeks is feasible with every rule on', (people, weeks) => {
    const r = makeRoster({ people, weeks });
    expect(r.people).toHaveLength(people);
    expect(r.shifts).toHaveLength(weeks * 7 * 3);
    const a = greedyRoster(r);
    expect(openCount(a)).toBe(0);
    expect(scoreRoster(r, a).feasible).toBe(true);
  });
});
