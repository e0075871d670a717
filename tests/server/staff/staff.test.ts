import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eachDayOfInterval, format, isTuesday, parseISO } from 'date-fns';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { agent, makeApp, makeUser, makeWorkspace, memoryMailer, PASSWORD, signedIn } from '../auth/helpers';
import { Person, type Workspace } from '../../../server/db/models';
import { Roster, WishRow } from '../../../server/rosters/models';
import { PairingRow } from '../../../server/rosters/models';
import { notifyPublished } from '../../../server/staff/notices';
import { makeApiRoster } from '../rosters/fixtures';
import { publishDirectly, seatsOf } from './publish-helper';

type Agent = ReturnType<typeof agent>;

describe('staff API: my shifts, wishes and pairing requests', () => {
  let db: TestDb;
  let app: Express;
  let mailer: ReturnType<typeof memoryMailer>;
  let workspace: Workspace;
  let coordinator: Agent;
  let staff: Agent;
  let staffEmail: string;
  let me: { id: number; name: string };
  let colleague: { id: number; name: string };
  let rosterId: number;

  beforeAll(async () => {
    db = await createTestDb();
    ({ app, mailer } = makeApp(db));
    workspace = await makeWorkspace('Fernhollow Lodge');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    // March 2027, Mon–Fri earlies with two seats: a first-aid seat and an open one.
    const fixture = await makeApiRoster(coordinator, workspace, { periodStart: '2027-03-01', periodEnd: '2027-03-14' });
    rosterId = fixture.roster.id;
    [me, colleague] = fixture.people;
    const user = await makeUser({ workspace, role: 'staff', displayName: me.name });
    staffEmail = user.email;
    await Person.update({ userId: user.id }, { where: { id: me.id } });
    staff = agent(app);
    expect((await staff.post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD })).status).toBe(200);
  });
  afterAll(async () => {
    await db.drop();
  });

  const wishCount = () => WishRow.count({ where: { rosterId } });

  it('tells a staff member without a linked person what to do, with a 409 in words', async () => {
    const { agent: unlinked } = await signedIn(app, workspace, 'staff');
    for (const url of ['/api/me/shifts', '/api/me/rosters', '/api/me/pairings', '/api/me/feed']) {
      const res = await unlinked.get(url);
      expect(res.status, url).toBe(409);
      expect(res.body.error.message).toMatch(/not linked to a person/);
    }
    expect((await unlinked.post(`/api/me/rosters/${rosterId}/wishes`).send({ date: '2027-03-02', kind: 'prefer' })).status).toBe(409);
    expect(await wishCount()).toBe(0);
  });

  it('sets, changes and deletes its own wish for a day; one wish per day', async () => {
    const first = await staff.post(`/api/me/rosters/${rosterId}/wishes`).send({ date: '2027-03-02', kind: 'prefer', note: 'School run is easier' });
    expect(first.status).toBe(201);
    expect(first.body.wish).toMatchObject({ date: '2027-03-02', shiftId: null, kind: 'prefer', note: 'School run is easier' });
    const changed = await staff.post(`/api/me/rosters/${rosterId}/wishes`).send({ date: '2027-03-02', kind: 'avoid' });
    expect(changed.status).toBe(200);
    expect(changed.body.wish).toMatchObject({ id: first.body.wish.id, kind: 'avoid', note: null });
    const stored = await WishRow.findAll({ where: { rosterId, personId: me.id } });
    expect(stored.map((w) => [w.date, w.kind, w.personId])).toEqual([['2027-03-02', 'avoid', me.id]]);

    const shifts = await seatsOf(workspace.id, rosterId);
    const perShift = await staff.post(`/api/me/rosters/${rosterId}/wishes`).send({ shiftId: shifts[0].shiftId, kind: 'prefer' });
    expect(perShift.status).toBe(201);
    const mine = await staff.get(`/api/me/rosters/${rosterId}/wishes`);
    expect(mine.status).toBe(200);
    expect(mine.body.wishes).toHaveLength(2);
    expect(mine.body.roster).toMatchObject({ id: rosterId, openForWishes: true, periodStart: '2027-03-01' });

    expect((await staff.delete(`/api/me/rosters/${rosterId}/wishes/${perShift.body.wish.id}`)).status).toBe(204);
    expect(await WishRow.count({ where: { rosterId, personId: me.id } })).toBe(1);
  });

  it.each([
    ['for another person', { personId: 0, date: '2027-03-03', kind: 'cannot' }, 403, 'body.personId'],
    ['before the period', { date: '2027-02-28', kind: 'cannot' }, 422, 'body.date'],
    ['after the period', { date: '2027-03-15', kind: 'avoid' }, 422, 'body.date'],
    ['with both a day and a shift', { date: '2027-03-03', shiftId: 1, kind: 'avoid' }, 400, 'body.date'],
    ['with neither a day nor a shift', { kind: 'avoid' }, 400, 'body.date'],
    ['with an unknown kind', { date: '2027-03-03', kind: 'maybe' }, 400, 'body.kind'],
    ['with a shift of no roster of theirs', { shiftId: 4000000001, kind: 'avoid' }, 422, 'body.shiftId'],
    ['with a note over 500 characters', { date: '2027-03-03', kind: 'avoid', note: 'x'.repeat(501) }, 400, 'body.note'],
    ['with a field the API does not know', { date: '2027-03-03', kind: 'avoid', strength: 1000 }, 400, 'body'],
  ])('refuses a wish %s, naming the field, and stores nothing', async (_label, body, status, field) => {
    const before = await wishCount();
    const sent = 'personId' in body ? { ...body, personId: colleague.id } : body;
    const res = await staff.post(`/api/me/rosters/${rosterId}/wishes`).send(sent);
    expect(res.status).toBe(status);
    expect(res.body.error.fields.map((f: { path: string }) => f.path)).toContain(field);
    expect(await wishCount()).toBe(before);
    expect(await WishRow.count({ where: { rosterId, personId: colleague.id } })).toBe(0);
  });

  it('does not let a staff member delete or see a colleague’s wish', async () => {
    const theirs = await coordinator.post(`/api/rosters/${rosterId}/wishes`).send({ personId: colleague.id, date: '2027-03-04', kind: 'cannot', note: 'private reason' });
    expect(theirs.status).toBe(201);
    const del = await staff.delete(`/api/me/rosters/${rosterId}/wishes/${theirs.body.id}`);
    expect(del.status).toBe(404);
    expect(await WishRow.count({ where: { id: theirs.body.id } })).toBe(1);
    const mine = await staff.get(`/api/me/rosters/${rosterId}/wishes`);
    expect(JSON.stringify(mine.body)).not.toContain('private reason');
    expect(mine.body.wishes.every((w: { id: number }) => w.id !== theirs.body.id)).toBe(true);
  });

  it('fills every Tuesday of the period from a weekly default', async () => {
    const res = await staff.post(`/api/me/rosters/${rosterId}/wishes/weekly`).send({ weekday: 'tue', kind: 'avoid', note: 'Choir on Tuesdays' });
    expect(res.status).toBe(200);
    // Independent count with date-fns: the Tuesdays of 1–14 March 2027 (the 2nd and the 9th).
    const tuesdays = eachDayOfInterval({ start: parseISO('2027-03-01'), end: parseISO('2027-03-14') })
      .filter((d) => isTuesday(d))
      .map((d) => format(d, 'yyyy-MM-dd'));
    expect(tuesdays).toEqual(['2027-03-02', '2027-03-09']);
    expect(res.body.wishes.map((w: { date: string }) => w.date).sort()).toEqual(tuesdays);
    const rows = await WishRow.findAll({ where: { rosterId, personId: me.id, shiftId: null } });
    // The earlier wish on Tuesday 2 March was replaced, not doubled.
    expect(rows.filter((w) => w.date === '2027-03-02')).toHaveLength(1);
    expect(rows.filter((w) => ['2027-03-02', '2027-03-09'].includes(w.date!)).every((w) => w.kind === 'avoid' && w.note === 'Choir on Tuesdays')).toBe(true);
  });

  it('enforces the coordinator’s limit on cannot days, all or nothing, with a clear message', async () => {
    const roster = (await coordinator.get(`/api/rosters/${rosterId}`)).body;
    expect((await coordinator.patch(`/api/rosters/${rosterId}`).send({ maxCannotDays: 2, version: roster.version })).status).toBe(200);
    expect((await staff.post(`/api/me/rosters/${rosterId}/wishes`).send({ date: '2027-03-10', kind: 'cannot' })).status).toBe(201);
    expect((await staff.post(`/api/me/rosters/${rosterId}/wishes`).send({ date: '2027-03-11', kind: 'cannot' })).status).toBe(201);
    // Saying cannot again about a day already counted is no new day.
    expect((await staff.post(`/api/me/rosters/${rosterId}/wishes`).send({ date: '2027-03-11', kind: 'cannot', note: 'dentist' })).status).toBe(200);
    const before = await WishRow.findAll({ where: { rosterId, personId: me.id }, order: [['id', 'ASC']] });

    const third = await staff.post(`/api/me/rosters/${rosterId}/wishes`).send({ date: '2027-03-12', kind: 'cannot' });
    expect(third.status).toBe(422);
    expect(third.body.error.message).toMatch(/at most 2 “cannot” days/);
    expect(third.body.error.fields[0].path).toBe('body.kind');
    // Turning an avoid into a cannot counts too.
    expect((await staff.post(`/api/me/rosters/${rosterId}/wishes`).send({ date: '2027-03-09', kind: 'cannot' })).status).toBe(422);
    const weekly = await staff.post(`/api/me/rosters/${rosterId}/wishes/weekly`).send({ weekday: 'fri', kind: 'cannot' });
    expect(weekly.status).toBe(422);
    const after = await WishRow.findAll({ where: { rosterId, personId: me.id }, order: [['id', 'ASC']] });
    expect(after.map((w) => [w.id, w.date, w.kind])).toEqual(before.map((w) => [w.id, w.date, w.kind]));
    expect((await staff.get(`/api/me/rosters/${rosterId}/wishes`)).body.cannotDaysUsed).toBe(2);
  });

  it('keeps wishes read-only after the deadline (403 naming the deadline) but still shows them', async () => {
    await Roster.update({ wishDeadline: new Date(Date.now() - 60_000) }, { where: { id: rosterId } });
    try {
      const before = await WishRow.findAll({ where: { rosterId }, order: [['id', 'ASC']] });
      const late = await staff.post(`/api/me/rosters/${rosterId}/wishes`).send({ date: '2027-03-05', kind: 'avoid' });
      expect(late.status).toBe(403);
      expect(late.body.error.message).toMatch(/closed at .* no longer changed/);
      expect(late.body.error.fields[0].path).toBe('roster.wishDeadline');
      expect((await staff.post(`/api/me/rosters/${rosterId}/wishes/weekly`).send({ weekday: 'mon', kind: 'avoid' })).status).toBe(403);
      const list = await staff.get(`/api/me/rosters/${rosterId}/wishes`);
      expect(list.status).toBe(200);
      expect(list.body.roster.openForWishes).toBe(false);
      expect(list.body.wishes.length).toBeGreaterThan(0);
      expect((await staff.delete(`/api/me/rosters/${rosterId}/wishes/${list.body.wishes[0].id}`)).status).toBe(403);
      const after = await WishRow.findAll({ where: { rosterId }, order: [['id', 'ASC']] });
      expect(after.map((w) => [w.id, w.kind, w.date])).toEqual(before.map((w) => [w.id, w.kind, w.date]));
    } finally {
      await Roster.update({ wishDeadline: null }, { where: { id: rosterId } });
    }
  });

  it('asks for a pairing with a reason only coordinators see; refuses bad requests', async () => {
    const third = (await Person.findOne({ where: { workspaceId: workspace.id, name: 'Person C' } }))!;
    const res = await staff.post('/api/me/pairings').send({ colleagueId: colleague.id, together: true, reason: 'We trained together and cover each other well' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ colleague: { id: colleague.id, name: colleague.name }, together: true, status: 'requested' });
    expect(res.body).not.toHaveProperty('score');
    expect(res.body).not.toHaveProperty('reason');

    const seen = await coordinator.get('/api/pairings');
    const row = seen.body.items.find((p: { id: number }) => p.id === res.body.id);
    expect(row).toMatchObject({ status: 'requested', reason: 'We trained together and cover each other well' });
    expect(row.score).toBeGreaterThan(0);

    const before = await PairingRow.count();
    for (const [body, status, field] of [
      [{ colleagueId: colleague.id, together: false, reason: 'again' }, 409, 'body.colleagueId'],
      [{ colleagueId: me.id, together: true, reason: 'me' }, 422, 'body.colleagueId'],
      [{ colleagueId: 4000000001, together: true, reason: 'nobody' }, 422, 'body.colleagueId'],
      [{ colleagueId: third.id, together: true, reason: '   ' }, 400, 'body.reason'],
      [{ colleagueId: third.id, reason: 'which way?' }, 400, 'body.together'],
    ] as const) {
      const bad = await staff.post('/api/me/pairings').send(body);
      expect(bad.status, JSON.stringify(body)).toBe(status);
      expect(bad.body.error.fields.map((f: { path: string }) => f.path)).toContain(field);
    }
    expect(await PairingRow.count()).toBe(before);

    // Apart, then withdrawn while still undecided.
    const apart = await staff.post('/api/me/pairings').send({ colleagueId: third.id, together: false, reason: 'We clash on handovers' });
    expect(apart.status).toBe(201);
    expect(apart.body.together).toBe(false);
    expect((await staff.delete(`/api/me/pairings/${apart.body.id}`)).status).toBe(204);
    // A decided request stays; a coordinator's own pairing is not the staff member's to delete.
    await PairingRow.update({ status: 'approved' }, { where: { id: res.body.id } });
    const decided = await staff.delete(`/api/me/pairings/${res.body.id}`);
    expect(decided.status).toBe(409);
    expect(decided.body.error.message).toMatch(/already approved/);
  });

  it('never shows staff pairing scores, other people’s requests or wishes, or unpublished rosters', async () => {
    const d = (await Person.findOne({ where: { workspaceId: workspace.id, name: 'Person D' } }))!;
    const e = (await Person.findOne({ where: { workspaceId: workspace.id, name: 'Person E' } }))!;
    const coordinatorPairing = await coordinator.post('/api/pairings').send({ personAId: me.id, personBId: d.id, score: -40, neverTogether: true, reason: 'kept apart after an incident' });
    expect(coordinatorPairing.status).toBe(201);
    await PairingRow.create({ workspaceId: workspace.id, personAId: colleague.id, personBId: e.id, score: 5, status: 'requested', reason: 'colleague asked privately', requestedByPersonId: colleague.id });

    const mine = await staff.get('/api/me/pairings');
    expect(mine.status).toBe(200);
    const text = JSON.stringify(mine.body);
    expect(text).not.toContain('score');
    expect(text).not.toContain('kept apart');
    expect(text).not.toContain('colleague asked privately');
    expect(mine.body.items.every((p: { colleague: { id: number } }) => p.colleague.id !== d.id && p.colleague.id !== e.id)).toBe(true);
    // Asking about someone a coordinator already decided about is refused without saying what was decided.
    const refused = await staff.post('/api/me/pairings').send({ colleagueId: d.id, together: true, reason: 'please' });
    expect(refused.status).toBe(409);
    expect(JSON.stringify(refused.body)).not.toMatch(/-40|incident|never/i);

    // A run exists with assignments, but nothing is published: staff see no shifts and no roster API.
    const seats = await seatsOf(workspace.id, rosterId);
    const { runId } = await publishDirectly(workspace.id, rosterId, seats.map((s) => ({ seatId: s.seatId, personId: me.id })));
    await Roster.update({ status: 'solved', publishedRunId: null, publishedAt: null }, { where: { id: rosterId } });
    expect((await staff.get('/api/me/shifts')).body.shifts).toEqual([]);
    for (const url of ['/api/rosters', `/api/rosters/${rosterId}`, `/api/rosters/${rosterId}/wishes`, `/api/rosters/${rosterId}/shifts`, `/api/rosters/${rosterId}/runs`, `/api/runs/${runId}`, '/api/pairings', '/api/people']) {
      expect((await staff.get(url)).status, url).toBe(403);
    }
    const wishes = await staff.get(`/api/me/rosters/${rosterId}/wishes`);
    expect(Object.keys(wishes.body).sort()).toEqual(['cannotDaysUsed', 'roster', 'shifts', 'wishes']);
    expect(JSON.stringify(wishes.body)).not.toMatch(/assign|personId|score|strength/);
  });

  it('lists published shifts with co-workers by name and the week’s hours against contract', async () => {
    const seats = await seatsOf(workspace.id, rosterId);
    // Me on the first seat of Mon 1, Wed 3 and Mon 8 March; the colleague beside me on the 1st.
    const day = (d: string, position: number) => seats.find((s) => s.startsLocal.startsWith(d) && s.position === position)!.seatId;
    await publishDirectly(workspace.id, rosterId, [
      { seatId: day('2027-03-01', 0), personId: me.id },
      { seatId: day('2027-03-01', 1), personId: colleague.id },
      { seatId: day('2027-03-03', 0), personId: me.id },
      { seatId: day('2027-03-03', 1), personId: null },
      { seatId: day('2027-03-08', 0), personId: me.id },
      { seatId: day('2027-03-09', 0), personId: colleague.id },
    ]);
    const res = await staff.get('/api/me/shifts').query({ week: '2027-03-03' });
    expect(res.status).toBe(200);
    expect(res.body.shifts.map((s: { startsLocal: string }) => s.startsLocal)).toEqual(['2027-03-01T07:00', '2027-03-03T07:00', '2027-03-08T07:00']);
    expect(res.body.shifts[0]).toMatchObject({ label: 'early', endsLocal: '2027-03-01T15:00', startsAt: '2027-03-01T07:00:00.000Z', hours: 8, coworkers: [colleague.name], timeZone: 'Europe/London' });
    expect(res.body.shifts[1].coworkers).toEqual([]);
    // Week of Mon 1 – Sun 7 March: two 8-hour earlies = 16 h, against the fixture's 30 h contract.
    expect(res.body.week).toEqual({ start: '2027-03-01', end: '2027-03-07', hours: 16, contractedHours: 30, shifts: 2 });
    expect(JSON.stringify(res.body)).not.toMatch(/personId|score/);
  });

  it('mails everyone their own shifts on publish, and on re-publish only those whose shifts changed', async () => {
    const seats = await seatsOf(workspace.id, rosterId);
    const day = (d: string, position: number) => seats.find((s) => s.startsLocal.startsWith(d) && s.position === position)!.seatId;
    mailer.outbox.length = 0;
    const first = await notifyPublished(workspace.id, rosterId);
    expect(first.sent.map((s) => s.to)).toEqual([staffEmail]); // the colleague has no address
    expect(first.noAddress.map((p) => p.name)).toEqual([colleague.name]);
    const mail = mailer.last(staffEmail)!;
    expect(mail.subject).toBe('Your shifts: Test roster');
    expect(mail.text).toContain('Mon 1 Mar: early, 07:00–15:00');
    expect(mail.text).toContain('Mon 8 Mar: early, 07:00–15:00');
    // Only their own shifts: Tuesday 9 March is the colleague's alone.
    expect(mail.text).not.toContain('9 Mar');

    await Person.update({ email: 'colleague@example.test' }, { where: { id: colleague.id } });
    const { previousRunId } = await publishDirectly(workspace.id, rosterId, [
      { seatId: day('2027-03-01', 0), personId: me.id },
      { seatId: day('2027-03-01', 1), personId: colleague.id },
      { seatId: day('2027-03-03', 0), personId: me.id },
      { seatId: day('2027-03-10', 0), personId: me.id }, // was Mon 8, now Wed 10
      { seatId: day('2027-03-09', 0), personId: colleague.id },
    ]);
    mailer.outbox.length = 0;
    const second = await notifyPublished(workspace.id, rosterId, previousRunId);
    expect(second.sent.map((s) => s.to)).toEqual([staffEmail]);
    expect(second.unchanged).toBe(1);
    const change = mailer.last(staffEmail)!;
    expect(change.subject).toBe('Your shifts changed: Test roster');
    expect(change.text).toMatch(/Now on:\n- Wed 10 Mar: early, 07:00–15:00/);
    expect(change.text).toMatch(/No longer on:\n- Mon 8 Mar: early, 07:00–15:00/);
    expect(change.html).toContain('Wed 10 Mar');

    // Reopened, Monday's shift moved an hour later, published again with the same people: both on it hear of it.
    const monday = seats.find((s) => s.startsLocal === '2027-03-01T07:00')!.shiftId;
    // DATETIME keeps whole seconds: the edit is stamped clearly after the run it follows.
    await db.sequelize.query("UPDATE shifts SET starts_local = '2027-03-01T08:00', version = version + 1, updated_at = DATE_ADD(NOW(), INTERVAL 2 SECOND) WHERE id = ?", { replacements: [monday] });
    const sameAgain = await publishDirectly(workspace.id, rosterId, [
      { seatId: day('2027-03-01', 0), personId: me.id },
      { seatId: day('2027-03-01', 1), personId: colleague.id },
      { seatId: day('2027-03-03', 0), personId: me.id },
      { seatId: day('2027-03-10', 0), personId: me.id },
      { seatId: day('2027-03-09', 0), personId: colleague.id },
    ]);
    mailer.outbox.length = 0;
    const third = await notifyPublished(workspace.id, rosterId, sameAgain.previousRunId);
    expect(third.sent.map((s) => s.to).sort()).toEqual(['colleague@example.test', staffEmail].sort());
    expect(mailer.last(staffEmail)!.text).toMatch(/Changed since the last version \(as it is now\):\n- Mon 1 Mar: early, 08:00–15:00/);
    expect(mailer.last(staffEmail)!.text).not.toContain('Now on:');
  });
});
