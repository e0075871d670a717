import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eachDayOfInterval, format, isSunday, parseISO } from 'date-fns';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { agent, makeApp, makeUser, makeWorkspace, PASSWORD, signedIn } from '../auth/helpers';
import { Person, type Workspace } from '../../../server/db/models';
import { WishRow } from '../../../server/rosters/models';
import { assembleRoster } from '../../../server/rosters/assemble';
import { rosterIds } from '../../../server/rosters/ids';
import { makeApiRoster } from '../rosters/fixtures';

type Agent = ReturnType<typeof agent>;

/**
 * Weekly wishes by shift kind (issue 20): "avoid Sunday nights" puts a wish on each night shift
 * that starts on a Sunday and leaves Sunday's other shifts and the whole-day wishes alone. The
 * Sundays are counted with date-fns, not with the project's own calendar code.
 */
describe('staff weekly wishes by shift kind', () => {
  let db: TestDb;
  let app: Express;
  let workspace: Workspace;
  let staff: Agent;
  let me: { id: number };
  let rosterId: number;

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    workspace = await makeWorkspace('Gorsebrook House');
    const coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    const all = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'];
    const fixture = await makeApiRoster(coordinator, workspace, {
      periodStart: '2027-03-01',
      periodEnd: '2027-03-21',
      patterns: [
        { label: 'early', weekdays: all, startTime: '07:00', endTime: '15:00', seats: [{ skillId: null, count: 1 }] },
        { label: 'night', weekdays: all, startTime: '21:00', endTime: '07:00', seats: [{ skillId: null, count: 1 }] },
        { label: 'twilight', weekdays: ['mon'], startTime: '17:00', endTime: '23:00', seats: [{ skillId: null, count: 1 }] },
      ],
    });
    rosterId = fixture.roster.id;
    me = fixture.people[0];
    const user = await makeUser({ workspace, role: 'staff' });
    await Person.update({ userId: user.id }, { where: { id: me.id } });
    staff = agent(app);
    expect((await staff.post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD })).status).toBe(200);
  });
  afterAll(async () => {
    await db.drop();
  });

  it('"avoid Sunday nights": one wish per Sunday night shift, none on the earlies or on the day', async () => {
    // A whole-day wish on one Sunday stays as it is.
    expect((await staff.post(`/api/me/rosters/${rosterId}/wishes`).send({ date: '2027-03-14', kind: 'prefer' })).status).toBe(201);
    const res = await staff.post(`/api/me/rosters/${rosterId}/wishes/weekly`).send({ weekday: 'sun', shiftLabel: 'night', kind: 'avoid', note: 'Family day' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const sundays = eachDayOfInterval({ start: parseISO('2027-03-01'), end: parseISO('2027-03-21') }).filter((d) => isSunday(d)).map((d) => format(d, 'yyyy-MM-dd'));
    expect(sundays).toEqual(['2027-03-07', '2027-03-14', '2027-03-21']);

    const mine = (await staff.get(`/api/me/rosters/${rosterId}/wishes`)).body as { shifts: Array<{ id: number; label: string; startsLocal: string }>; wishes: Array<{ shiftId: number | null; date: string | null; kind: string; note: string | null }> };
    const shiftOf = new Map(mine.shifts.map((s) => [s.id, s]));
    const shiftWishes = mine.wishes.filter((w) => w.shiftId !== null);
    expect(shiftWishes.map((w) => [shiftOf.get(w.shiftId!)!.label, shiftOf.get(w.shiftId!)!.startsLocal])).toEqual(sundays.map((d) => ['night', `${d}T21:00`]));
    expect(shiftWishes.every((w) => w.kind === 'avoid' && w.note === 'Family day')).toBe(true);
    expect(mine.wishes.filter((w) => w.date !== null)).toEqual([expect.objectContaining({ date: '2027-03-14', kind: 'prefer' })]);

    // The solver sees them as wishes about those shifts, not about the days.
    const { input } = await assembleRoster(workspace.id, rosterId);
    const nights = shiftWishes.map((w) => rosterIds.shift(w.shiftId!));
    expect((input.wishes ?? []).filter((w) => 'shift' in w && w.shift).map((w) => (w as { shift: string }).shift).sort()).toEqual([...nights].sort());

    // Saying it again changes the same wishes instead of adding more.
    const again = await staff.post(`/api/me/rosters/${rosterId}/wishes/weekly`).send({ weekday: 'sun', shiftLabel: 'night', kind: 'cannot' });
    expect(again.status).toBe(200);
    const rows = await WishRow.findAll({ where: { rosterId, personId: me.id, date: null } });
    expect(rows).toHaveLength(3);
    expect(rows.every((w) => w.kind === 'cannot')).toBe(true);
  });

  it('names the field when the kind of shift does not run on that weekday or does not exist, and stores nothing', async () => {
    const before = await WishRow.count({ where: { rosterId } });
    const tuesday = await staff.post(`/api/me/rosters/${rosterId}/wishes/weekly`).send({ weekday: 'tue', shiftLabel: 'twilight', kind: 'avoid' });
    expect(tuesday.status).toBe(422);
    expect(tuesday.body.error.fields[0].path).toBe('body.shiftLabel');
    expect(tuesday.body.error.message).toMatch(/none starts on a Tuesday/);
    const unknown = await staff.post(`/api/me/rosters/${rosterId}/wishes/weekly`).send({ weekday: 'mon', shiftLabel: 'late', kind: 'avoid' });
    expect(unknown.status).toBe(422);
    expect(unknown.body.error.message).toMatch(/no shift called “late”/);
    const blank = await staff.post(`/api/me/rosters/${rosterId}/wishes/weekly`).send({ weekday: 'mon', shiftLabel: '   ', kind: 'avoid' });
    expect(blank.status).toBe(400);
    expect(blank.body.error.fields[0].path).toBe('body.shiftLabel');
    expect(await WishRow.count({ where: { rosterId } })).toBe(before);
    // The Monday twilight exists: three Mondays in the period.
    const monday = await staff.post(`/api/me/rosters/${rosterId}/wishes/weekly`).send({ weekday: 'mon', shiftLabel: 'twilight', kind: 'prefer' });
    expect(monday.status).toBe(200);
    expect(monday.body.wishes).toHaveLength(3);
  });
});
