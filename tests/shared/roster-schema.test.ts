import { describe, expect, it } from 'vitest';
import { parseRoster, rosterSchema, type RosterInput } from '../../shared/roster/schema';
import { makeWillowmereRoster } from '../../shared/demo/willowmere';

/** A small valid roster as a plain object (written by hand, not by the fixture code under test). */
function base(): RosterInput {
  return {
    period: { start: '2027-01-04', end: '2027-01-10', timeZone: 'Europe/London' },
    skills: [{ id: 'med', name: 'Medication round' }],
    people: [
      { id: 'ada', name: 'Ada Brook', skills: ['med'], contractedHoursPerWeek: 30 },
      { id: 'ben', name: 'Ben Carrow', skills: [] },
    ],
    shifts: [
      { id: 'late-mon', patternLabel: 'late', start: '2027-01-04T14:30', end: '2027-01-04T22:30' },
      { id: 'early-tue', patternLabel: 'early', start: '2027-01-05T07:00', end: '2027-01-05T15:00' },
    ],
    seats: [
      { id: 's1', shift: 'late-mon', skill: 'med' },
      { id: 's2', shift: 'early-tue', skill: null },
    ],
    wishes: [{ person: 'ben', date: '2027-01-05', kind: 'avoid', strength: 2 }],
    pairings: [{ a: 'ada', b: 'ben', score: 3 }],
    pins: [{ seat: 's1', person: 'ada' }],
  };
}

function issuesOf(input: unknown) {
  const r = parseRoster(input);
  expect(r.ok).toBe(false);
  return r.ok ? [] : r.issues;
}

describe('roster schema', () => {
  it('accepts a valid roster and fills rule defaults from Directive 2003/88/EC', () => {
    const r = parseRoster(base());
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    // Art. 3: 11 h daily rest; Art. 6: 48 h; Art. 8: 8 h nights; Art. 5: one rest day in 7 (our reading)
    expect(r.roster.rules.minRest.hours).toBe(11);
    expect(r.roster.rules.maxHoursPer7Days.hours).toBe(48);
    expect(r.roster.rules.nightShiftLength.hours).toBe(8);
    // Art. 5: 24 h + the 11 h of Art. 3 in every 7 days; Art. 6: 48 h average; Art. 8: 8 h per 24 h
    expect(r.roster.rules.weeklyRest).toMatchObject({ days: 7, hours: 35 });
    expect(r.roster.rules.averageWeeklyHours).toMatchObject({ hours: 48, hard: true });
    expect(r.roster.rules.nightAverage).toMatchObject({ hours: 8, hard: true });
    // the two local policies (no source) are off until a workplace turns them on
    expect(r.roster.rules.shiftsPerWindow.enabled).toBe(false);
    expect(r.roster.rules.maxHoursPer7Days.enabled).toBe(false);
    expect(Object.entries(r.roster.rules).every(([id, rule]) => rule.enabled || id === 'shiftsPerWindow' || id === 'maxHoursPer7Days')).toBe(true);
  });

  it('names the field of a shift that ends before it starts', () => {
    const x = base();
    x.shifts[1].end = '2027-01-05T06:00';
    expect(issuesOf(x)).toContainEqual(expect.objectContaining({ path: 'shifts[1].end' }));
  });

  it('rejects a period over 366 days', () => {
    const x = base();
    x.period.end = '2028-01-05'; // 367 days from 2027-01-04 inclusive
    expect(issuesOf(x)).toContainEqual(expect.objectContaining({ path: 'period.end', message: expect.stringContaining('367') }));
    x.period.end = '2028-01-04'; // 366 days: allowed
    expect(parseRoster(x).ok).toBe(true);
  });

  it('rejects a pairing of a person with themself', () => {
    const x = base();
    x.pairings = [{ a: 'ada', b: 'ada', score: 1 }];
    expect(issuesOf(x)).toContainEqual(expect.objectContaining({ path: 'pairings[0].b', message: expect.stringContaining('themself') }));
  });

  it('names unknown person, skill, shift and seat references', () => {
    const x = base();
    x.people[1].skills = ['juggling'];
    x.seats[1].shift = 'nope';
    x.wishes = [{ person: 'zed', shift: 'late-mon', kind: 'prefer' }];
    x.pins = [{ seat: 's9', person: 'ada' }];
    x.pairings = [{ a: 'ada', b: 'zed', score: 1 }];
    const paths = issuesOf(x).map((i) => i.path);
    expect(paths).toEqual(expect.arrayContaining(['people[1].skills[0]', 'seats[1].shift', 'wishes[0].person', 'pins[0].seat', 'pairings[0].b']));
  });

  it('rejects a seat needing a skill nobody has', () => {
    const x = base();
    x.skills.push({ id: 'night-lead', name: 'Night lead' });
    x.seats[1].skill = 'night-lead';
    expect(issuesOf(x)).toContainEqual(expect.objectContaining({ path: 'seats[1].skill', message: expect.stringContaining('nobody') }));
  });

  it('rejects wrong types, bad dates, bad time zones and duplicate ids with paths', () => {
    const x = base() as unknown as Record<string, any>;
    x.people[0].contractedHoursPerWeek = 'forty';
    x.shifts[0].start = '2027-02-30T07:00';
    x.period.timeZone = 'Mars/Olympus';
    x.seats[1].id = 's1';
    const paths = issuesOf(x).map((i) => i.path);
    expect(paths).toEqual(expect.arrayContaining(['people[0].contractedHoursPerWeek', 'shifts[0].start', 'period.timeZone']));
    const y = base();
    y.seats[1].id = 's1';
    expect(issuesOf(y).map((i) => i.path)).toContain('seats[1].id');
  });

  it('requires a wish to name exactly one of date or shift', () => {
    const x = base();
    x.wishes = [{ person: 'ada', kind: 'cannot' }];
    expect(issuesOf(x)).toContainEqual(expect.objectContaining({ path: 'wishes[0]' }));
  });

  it('rejects a pin to a person without the seat’s skill', () => {
    const x = base();
    x.pins = [{ seat: 's1', person: 'ben' }];
    expect(issuesOf(x)).toContainEqual(expect.objectContaining({ path: 'pins[0].person' }));
  });

  it('caps oversized arrays', () => {
    const x = base();
    x.pairings = Array.from({ length: 20_001 }, () => ({ a: 'ada', b: 'ben', score: 1 }));
    expect(issuesOf(x).map((i) => i.path)).toContain('pairings');
  });

  it('round-trips the demo roster through JSON unchanged', () => {
    const demo = makeWillowmereRoster();
    expect(rosterSchema.parse(JSON.parse(JSON.stringify(demo)))).toEqual(demo);
  });
});
