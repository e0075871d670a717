import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeWorkspace } from '../auth/helpers';
import { importRosterJson } from '../../../server/rosters/import';
import { assembleRoster } from '../../../server/rosters/assemble';
import { rosterSchema } from '../../../shared/roster/schema';

describe('a roster file with absences and per-person terms survives import and assembly unchanged', () => {
  let db: TestDb;
  beforeAll(async () => {
    db = await createTestDb();
  });
  afterAll(async () => {
    await db.drop();
  });

  it('keeps whole-day and part-day absences, their credited hours and dated terms', async () => {
    const workspace = await makeWorkspace('Saltmarsh Kitchen');
    const file = rosterSchema.parse({
      period: { start: '2027-05-03', end: '2027-05-09', timeZone: 'Europe/Berlin' },
      skills: [],
      people: [
        { id: 'juno', name: 'Juno Ashgrove', contractedHoursPerWeek: 30, terms: [{ kind: 'noNights' }, { kind: 'daysOff', weekdays: ['sun'], hard: false, weight: 3, from: '2027-05-05' }] },
        { id: 'kit', name: 'Kit Ellery', contractedHoursPerWeek: 20 },
      ],
      shifts: [{ id: 'e1', patternLabel: 'early', start: '2027-05-03T07:00', end: '2027-05-03T15:00' }],
      seats: [{ id: 'a', shift: 'e1' }],
      absences: [
        { person: 'juno', kind: 'annual', start: '2027-05-04T00:00', end: '2027-05-06T00:00', creditHours: 12 },
        { person: 'kit', kind: 'training', start: '2027-05-07T09:00', end: '2027-05-07T13:00', creditHours: 4 },
      ],
    });
    const { rosterId } = await db.sequelize.transaction((transaction) => importRosterJson(workspace.id, file, { name: 'May week', transaction }));
    const { parsed } = await assembleRoster(workspace.id, rosterId);
    expect(parsed.ok).toBe(true);
    if (!parsed.ok) return;
    const name = new Map(parsed.roster.people.map((p) => [p.id, p.name]));
    expect(parsed.roster.absences.map((a) => ({ ...a, person: name.get(a.person) }))).toEqual([
      { person: 'Juno Ashgrove', kind: 'annual', start: '2027-05-04T00:00', end: '2027-05-06T00:00', creditHours: 12 },
      { person: 'Kit Ellery', kind: 'training', start: '2027-05-07T09:00', end: '2027-05-07T13:00', creditHours: 4 },
    ]);
    expect(parsed.roster.people.find((p) => p.name === 'Juno Ashgrove')!.terms).toEqual([
      { kind: 'noNights', hard: true, weight: 10 },
      { kind: 'daysOff', weekdays: ['sun'], hard: false, weight: 3, from: '2027-05-05' },
    ]);
  });
});
