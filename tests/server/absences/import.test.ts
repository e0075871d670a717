import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makePerson, makeWorkspace, signedIn } from '../auth/helpers';
import type { Workspace } from '../../../server/db/models';
import { AbsenceRow } from '../../../server/absences/models';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

/**
 * CSV import of absences. The quoting cases follow RFC 4180 section 2: fields holding commas,
 * double quotes or line breaks are enclosed in double quotes (rule 6), and a double quote inside
 * such a field is written twice (rule 7).
 */
describe('absences CSV import: preview, all-or-nothing commit', () => {
  let db: TestDb;
  let app: Express;
  let workspace: Workspace;
  let coordinator: Agent;
  let ids: Record<string, number>;

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    workspace = await makeWorkspace('Tamsin Court');
    const other = await makeWorkspace('Elsewhere Yard');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    ids = {
      ines: (await makePerson(workspace, { name: 'Ines Varga' })).id,
      odo: (await makePerson(workspace, { name: 'Odo Brell', email: 'odo.brell@example.test' })).id,
      twinA: (await makePerson(workspace, { name: 'Sam Reed', email: 'sam.a@example.test' })).id,
      twinB: (await makePerson(workspace, { name: 'Sam Reed', email: 'sam.b@example.test' })).id,
    };
    await makePerson(other, { name: 'Pell Orrin' });
  });
  afterAll(async () => {
    await db.drop();
  });

  const count = () => AbsenceRow.count({ where: { workspaceId: workspace.id } });
  const send = (csv: string, commit = false) => coordinator.post('/api/absences/import').send({ csv, commit });

  const good = [
    'person,kind,start_date,end_date,start_time,end_time,credit_hours,note',
    // Rule 6: a comma inside quotes; rule 7: doubled quotes; rule 6: a line break inside quotes.
    '"Varga, Ines",annual,2027-03-01,2027-03-05,,,,"Trip, long planned"',
    'odo.brell@example.test,Sick leave,2027-03-02,2027-03-02,09:00,12:00,,"Said ""back by noon"""',
    'sam.b@example.test,training,2027-03-08,2027-03-09,,,12,"Course day 1\nCourse day 2"',
  ].join('\r\n');

  it('previews quoted fields per RFC 4180 and matches people by name or e-mail, saving nothing', async () => {
    // "Varga, Ines" is not a name in the workspace: the comma stayed inside the field, so it is an error (not two columns).
    const first = await send(good);
    expect(first.status).toBe(200);
    expect(first.body.rows[0]).toMatchObject({ row: 2, personName: 'Varga, Ines', personId: null, errors: [{ column: 'person', message: 'no person "Varga, Ines" in this workspace' }] });
    const fixed = good.replace('"Varga, Ines"', 'ines varga');
    const res = await send(fixed);
    expect(res.body).toMatchObject({ valid: 3, invalid: 0, canCommit: true, committed: false });
    expect(res.body.rows.map((r: { personId: number; kind: string; row: number }) => [r.row, r.personId, r.kind])).toEqual([
      [2, ids.ines, 'annual'],
      [3, ids.odo, 'sick'],
      [4, ids.twinB, 'training'],
    ]);
    expect(await count()).toBe(0);
  });

  it('commits every row approved, with quotes and line breaks kept', async () => {
    const res = await send(good.replace('"Varga, Ines"', 'Ines Varga'), true);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ valid: 3, invalid: 0, committed: true });
    const list = (await coordinator.get('/api/absences')).body.items;
    expect(list.map((a: { personId: number; status: string; note: string }) => [a.personId, a.status, a.note])).toEqual([
      [ids.ines, 'approved', 'Trip, long planned'],
      [ids.odo, 'approved', 'Said "back by noon"'],
      [ids.twinB, 'approved', 'Course day 1\nCourse day 2'],
    ]);
    expect(list[1]).toMatchObject({ startTime: '09:00', endTime: '12:00', creditedHours: 3 });
    expect(list[2]).toMatchObject({ creditHours: 12, creditedHours: 12 });
  });

  it('refuses a commit with any bad row, saving none of them, and lists every problem', async () => {
    const before = await count();
    const csv = [
      'Person;Kind;Start date;End date',
      'Odo Brell;annual;2027-04-05;2027-04-06',
      'Sam Reed;annual;2027-04-05;2027-04-06',
      'Pell Orrin;annual;2027-04-05;2027-04-06',
      'Ines Varga;holiday;2027-02-30;2027-04-06',
      'Ines Varga;annual;2027-03-04;2027-03-04',
      'Odo Brell;sick;2027-04-06;2027-04-07',
      'Ines Varga;annual;2027-05-10;2027-05-07',
    ].join('\n');
    // Semicolons are not what this import reads: the whole line is one "person" column, so the header is unknown.
    const semi = await send(csv, true);
    expect(semi.status).toBe(422);
    expect(semi.body.error.fields[0].path).toBe('body.csv');
    const res = await send(csv.replace(/;/g, ','), true);
    expect(res.status).toBe(422);
    expect(res.body.error.message).toBe('6 of 7 rows have problems; nothing was imported. Fix them and try again.');
    const errs = (row: number) => res.body.report.rows.find((r: { row: number }) => r.row === row).errors;
    expect(errs(2)).toEqual([]);
    expect(errs(3)[0].message).toBe('2 people are called "Sam Reed"; use their e-mail address');
    expect(errs(4)[0].message).toBe('no person "Pell Orrin" in this workspace');
    expect(errs(5).map((e: { column: string }) => e.column)).toEqual(['kind', 'start_date']);
    expect(errs(6)[0]).toMatchObject({ column: 'start_date', message: 'overlaps annual leave from Mon 1 Mar to Fri 5 Mar already on record (approved)' });
    expect(errs(7)[0]).toMatchObject({ column: 'start_date', message: 'overlaps row 2 of this file' });
    expect(errs(8)[0]).toMatchObject({ column: 'end_date', message: 'the absence ends before it starts' });
    expect(await count()).toBe(before);
  });

  it('answers malformed files with a 422 naming body.csv', async () => {
    const cases: Array<[string, RegExp]> = [
      ['person,kind,start_date,end_date\n"Ines Varga,annual,2027-06-01,2027-06-01\n', /not valid CSV.*Quote Not Closed/i],
      ['person,kind,start_date\nInes Varga,annual,2027-06-01\n', /lacks end_date/],
      ['person,kind,start_date,end_date,holiday\n', /Unknown column "holiday"/],
      ['person,kind,start_date,end_date\n', /no absences/],
    ];
    for (const [csv, message] of cases) {
      const res = await send(csv, true);
      expect(res.status, csv).toBe(422);
      expect(res.body.error.message).toMatch(message);
      expect(res.body.error.fields[0].path).toBe('body.csv');
    }
    expect((await send('')).body.error.fields[0].path).toBe('body.csv');
  });
});
