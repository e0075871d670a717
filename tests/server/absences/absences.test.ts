import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { agent, makeApp, makePerson, makeUser, makeWorkspace, memoryMailer, PASSWORD, signedIn } from '../auth/helpers';
import { Person, type Workspace } from '../../../server/db/models';
import { AbsenceRow } from '../../../server/absences/models';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

/**
 * Absences API. Calendar facts used below (checked against any calendar): 1 March 2027 is a
 * Monday, so 1–7 March is Mon–Sun; 12 March 2027 is a Friday; 2027 is not a leap year.
 */
describe('absences API: entry, credit, decisions, staff requests, bad input', () => {
  let db: TestDb;
  let app: Express;
  let mailer: ReturnType<typeof memoryMailer>;
  let workspace: Workspace;
  let other: Workspace;
  let coordinator: Agent;
  let admin: Agent;
  let otherCoordinator: Agent;
  let staff: Agent;
  let staffEmail: string;
  let ines: Person;
  let odo: Person;
  let mute: Person;
  let outsider: Person;

  beforeAll(async () => {
    db = await createTestDb();
    ({ app, mailer } = makeApp(db));
    workspace = await makeWorkspace('Larkspur Ward');
    other = await makeWorkspace('Quillby Annex');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    admin = (await signedIn(app, workspace, 'admin')).agent;
    otherCoordinator = (await signedIn(app, other, 'coordinator')).agent;
    const user = await makeUser({ workspace, role: 'staff', displayName: 'Ines Varga' });
    staffEmail = user.email;
    ines = await makePerson(workspace, { name: 'Ines Varga', userId: user.id }); // 30 contracted hours (fixture)
    odo = await makePerson(workspace, { name: 'Odo Brell', email: 'odo.brell@example.test' });
    mute = await makePerson(workspace, { name: 'Mira Tansy' }); // no address, no login
    outsider = await makePerson(other, { name: 'Pell Orrin' });
    staff = agent(app);
    expect((await staff.post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD })).status).toBe(200);
  });
  afterAll(async () => {
    await db.drop();
  });

  const count = () => AbsenceRow.count({ where: { workspaceId: workspace.id } });
  const create = (body: Record<string, unknown>, who: Agent = coordinator) => who.post('/api/absences').send(body);

  it('a coordinator enters an approved absence; contracted credit is weekly hours ÷ 5 per weekday', async () => {
    const res = await create({ personId: ines.id, kind: 'annual', startDate: '2027-03-01', endDate: '2027-03-07', note: 'Family visit' });
    expect(res.status).toBe(201);
    // Mon–Fri at 30/5 = 6 h, nothing for Sat and Sun: 30 h.
    expect(res.body).toMatchObject({ personId: ines.id, personName: 'Ines Varga', kind: 'annual', status: 'approved', creditHours: null, creditedHours: 30, startTime: null, endTime: null, note: 'Family visit', version: 1 });
    expect(res.body.decidedByName).toBe('Fixture Person');
    expect(res.body.decidedAt).not.toBeNull();
    const list = await coordinator.get('/api/absences');
    expect(list.status).toBe(200);
    expect(list.body.items.map((a: { id: number }) => a.id)).toEqual([res.body.id]);
  });

  it('part days credit the hours they span, capped at the day; entered hours win; settings change the default', async () => {
    // Wed 10 March 09:00–13:00: 4 h, under the 6 h day.
    const part = await create({ personId: odo.id, kind: 'training', startDate: '2027-03-10', endDate: '2027-03-10', startTime: '09:00', endTime: '13:00' });
    expect(part.status).toBe(201);
    expect(part.body.creditedHours).toBe(4);
    // Thu 11 12:00 → Fri 12 10:00: 12 h and 10 h, each capped at 6 h.
    const across = await create({ personId: odo.id, kind: 'training', startDate: '2027-03-11', endDate: '2027-03-12', startTime: '12:00', endTime: '10:00' });
    expect(across.status).toBe(201);
    expect(across.body.creditedHours).toBe(12);
    const entered = await create({ personId: odo.id, kind: 'other', startDate: '2027-03-15', endDate: '2027-03-16', creditHours: 3.5 });
    expect(entered.body).toMatchObject({ creditHours: 3.5, creditedHours: 3.5 });

    const defaults = await coordinator.get('/api/absences/settings');
    expect(defaults.body).toEqual({ credits: { annual: 'contracted', sick: 'contracted', training: 'contracted', parental: 'contracted', other: 0 } });
    const put = await coordinator.put('/api/absences/settings').send({ credits: { ...defaults.body.credits, sick: 7.5 } });
    expect(put.status).toBe(200);
    expect(put.body.credits.sick).toBe(7.5);
    // A number counts every day absent, weekends too: Sat 20 + Sun 21 March = 15 h.
    const sick = await create({ personId: odo.id, kind: 'sick', startDate: '2027-03-20', endDate: '2027-03-21' });
    expect(sick.body.creditedHours).toBe(15);
    expect((await coordinator.put('/api/absences/settings').send({ credits: { ...defaults.body.credits, sick: 30 } })).body.error.fields[0].path).toBe('body.credits.sick');
    // Settings are per workspace.
    expect((await otherCoordinator.get('/api/absences/settings')).body.credits.sick).toBe('contracted');
  });

  it('filters the list by person, status and dates touching a range', async () => {
    const byPerson = await coordinator.get(`/api/absences?personId=${odo.id}`);
    expect(byPerson.body.items.every((a: { personId: number }) => a.personId === odo.id)).toBe(true);
    expect(byPerson.body.items).toHaveLength(4);
    const touching = await coordinator.get('/api/absences?from=2027-03-07&to=2027-03-10');
    expect(touching.body.items.map((a: { startDate: string }) => a.startDate)).toEqual(['2027-03-01', '2027-03-10']);
    expect((await coordinator.get('/api/absences?status=requested')).body.items).toEqual([]);
    expect((await coordinator.get('/api/absences?status=maybe')).body.error.fields[0].path).toBe('query.status');
  });

  describe('bad input: a 4xx naming the field, nothing changes', () => {
    it('an absence that ends before it starts', async () => {
      const before = await count();
      const res = await create({ personId: ines.id, kind: 'annual', startDate: '2027-04-10', endDate: '2027-04-09' });
      expect(res.status).toBe(400);
      expect(res.body.error.fields.map((f: { path: string }) => f.path)).toEqual(['body.endDate']);
      const sameDay = await create({ personId: ines.id, kind: 'annual', startDate: '2027-04-10', endDate: '2027-04-10', startTime: '14:00', endTime: '09:00' });
      expect(sameDay.status).toBe(400);
      expect(sameDay.body.error.fields[0].path).toBe('body.endTime');
      // A single day ending at 00:00 has no length at all.
      const empty = await create({ personId: ines.id, kind: 'annual', startDate: '2027-04-10', endDate: '2027-04-10', endTime: '00:00' });
      expect(empty.status).toBe(400);
      expect(empty.body.error.fields[0].path).toBe('body.endTime');
      expect(await count()).toBe(before);
    });

    it('overlapping absences of one person (approved or requested; declined ones do not count)', async () => {
      const before = await count();
      const res = await create({ personId: ines.id, kind: 'sick', startDate: '2027-03-05', endDate: '2027-03-09' });
      expect(res.status).toBe(409);
      expect(res.body.error.fields[0].path).toBe('body.startDate');
      expect(res.body.error.message).toBe('Ines Varga already has annual leave from Mon 1 Mar to Sun 7 Mar (approved); it overlaps this one. Change or remove that absence first.');
      // Part days on the same date that do not meet are fine; ones that meet are not.
      const morning = await create({ personId: odo.id, kind: 'other', startDate: '2027-03-10', endDate: '2027-03-10', startTime: '13:00', endTime: '17:00' });
      expect(morning.status).toBe(201);
      const clash = await create({ personId: odo.id, kind: 'other', startDate: '2027-03-10', endDate: '2027-03-10', startTime: '12:59', endTime: '13:30' });
      expect(clash.status).toBe(409);
      expect(clash.body.error.message).toMatch(/already has training on Wed 10 Mar 09:00–13:00 \(approved\)/);
      // Another person on the same days is no overlap.
      expect((await create({ personId: mute.id, kind: 'annual', startDate: '2027-03-05', endDate: '2027-03-09' })).status).toBe(201);
      expect(await count()).toBe(before + 2);
    });

    it('a person of another workspace, or no such person', async () => {
      const before = await count();
      for (const personId of [outsider.id, 999999]) {
        const res = await create({ personId, kind: 'annual', startDate: '2027-05-03', endDate: '2027-05-04' });
        expect(res.status).toBe(404);
        expect(res.body.error.fields[0].path).toBe('body.personId');
      }
      expect(await count()).toBe(before);
    });

    it('unknown kinds, impossible dates and bad times', async () => {
      const before = await count();
      const cases: Array<[Record<string, unknown>, string]> = [
        [{ kind: 'holiday' }, 'body.kind'],
        [{ startDate: '2027-02-30' }, 'body.startDate'],
        [{ endDate: '2027-13-01' }, 'body.endDate'],
        [{ startDate: '3/5/2027' }, 'body.startDate'],
        [{ startTime: '25:00' }, 'body.startTime'],
        [{ creditHours: -1 }, 'body.creditHours'],
        [{ personId: 'ines' }, 'body.personId'],
      ];
      for (const [change, path] of cases) {
        const res = await create({ personId: ines.id, kind: 'annual', startDate: '2027-06-01', endDate: '2027-06-02', ...change });
        expect(res.status, path).toBe(400);
        expect(res.body.error.code).toBe('validation_failed');
        expect(res.body.error.fields.map((f: { path: string }) => f.path)).toContain(path);
      }
      expect(await count()).toBe(before);
    });

    it('two overlapping creates at once: one 201 and one 409, never a 500', async () => {
      for (let round = 0; round < 3; round++) {
        const day = `2027-07-${String(10 + round * 3).padStart(2, '0')}`;
        const answers = await Promise.all([
          create({ personId: odo.id, kind: 'annual', startDate: day, endDate: day }),
          create({ personId: odo.id, kind: 'sick', startDate: day, endDate: day }, admin),
        ]);
        expect(answers.map((a) => a.status).sort()).toEqual([201, 409]);
        expect(await AbsenceRow.count({ where: { personId: odo.id, startDate: day } })).toBe(1);
      }
    });
  });

  it('edits with the version seen: a stale edit, an edit into an overlap and an end before the stored start are refused', async () => {
    const made = await create({ personId: mute.id, kind: 'annual', startDate: '2027-08-02', endDate: '2027-08-03' });
    const ok = await coordinator.patch(`/api/absences/${made.body.id}`).send({ endDate: '2027-08-06', version: 1 });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ endDate: '2027-08-06', version: 2, creditedHours: 30 });
    const stale = await coordinator.patch(`/api/absences/${made.body.id}`).send({ endDate: '2027-08-04', version: 1 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.fields[0].path).toBe('body.version');
    const backwards = await coordinator.patch(`/api/absences/${made.body.id}`).send({ endDate: '2027-08-01', version: 2 });
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.fields[0].path).toBe('body.endDate');
    const into = await coordinator.patch(`/api/absences/${made.body.id}`).send({ startDate: '2027-03-08', version: 2 });
    expect(into.status).toBe(409);
    expect(into.body.error.fields[0].path).toBe('body.startDate');
    expect(into.body.error.message).toMatch(/Mira Tansy already has annual leave from Fri 5 Mar to Tue 9 Mar/);
    expect((await coordinator.get(`/api/absences?personId=${mute.id}&from=2027-08-01`)).body.items[0]).toMatchObject({ startDate: '2027-08-02', endDate: '2027-08-06', version: 2 });
  });

  it('keeps workspaces apart: another workspace sees none, and its ids are 404s', async () => {
    const mine = (await coordinator.get('/api/absences')).body.items[0];
    expect((await otherCoordinator.get('/api/absences')).body.items).toEqual([]);
    expect((await otherCoordinator.patch(`/api/absences/${mine.id}`).send({ note: 'x', version: mine.version })).status).toBe(404);
    expect((await otherCoordinator.post(`/api/absences/${mine.id}/decision`).send({ decision: 'decline', version: mine.version })).status).toBe(404);
    expect((await otherCoordinator.delete(`/api/absences/${mine.id}`)).status).toBe(404);
    expect((await otherCoordinator.get('/api/absences/conflicts')).body.items).toEqual([]);
    expect((await coordinator.get(`/api/absences/${mine.id}`)).status).toBe(404); // no such route: reads go through the list
    expect(await AbsenceRow.count({ where: { id: mine.id } })).toBe(1);
  });

  describe('staff: their own absences from their phone', () => {
    it('requests an absence (status requested), sees only their own, and cannot grant themselves hours', async () => {
      const res = await staff.post('/api/me/absences').send({ kind: 'annual', startDate: '2027-09-06', endDate: '2027-09-10', note: 'Wedding' });
      expect(res.status).toBe(201);
      expect(res.body).toMatchObject({ personId: ines.id, status: 'requested', requestedByName: 'Ines Varga', decidedByName: null, creditedHours: 30 });
      const mine = await staff.get('/api/me/absences');
      expect(mine.status).toBe(200);
      expect(mine.body.items.every((a: { personId: number }) => a.personId === ines.id)).toBe(true);
      expect(mine.body.items.map((a: { status: string }) => a.status).sort()).toEqual(['approved', 'requested']);
      const hours = await staff.post('/api/me/absences').send({ kind: 'annual', startDate: '2027-09-20', endDate: '2027-09-20', creditHours: 40 });
      expect(hours.status).toBe(403);
      expect(hours.body.error.fields[0].path).toBe('body.creditHours');
      // A body naming someone else is not a way in: the person is always the caller's.
      const someone = await staff.post('/api/me/absences').send({ kind: 'sick', startDate: '2027-09-21', endDate: '2027-09-21', personId: odo.id });
      expect(someone.status).toBe(201);
      expect(someone.body.personId).toBe(ines.id);
      expect((await staff.delete(`/api/me/absences/${someone.body.id}`)).status).toBe(204);
    });

    it('a requested absence blocks overlapping ones too', async () => {
      const res = await staff.post('/api/me/absences').send({ kind: 'sick', startDate: '2027-09-10', endDate: '2027-09-11' });
      expect(res.status).toBe(409);
      expect(res.body.error.fields[0].path).toBe('body.startDate');
      expect(res.body.error.message).toMatch(/\(requested\)/);
      expect((await staff.post('/api/me/absences').send({ kind: 'sick', startDate: '2027-09-12', endDate: '2027-09-01' })).body.error.fields[0].path).toBe('body.endDate');
    });

    it('a staff member without a linked person gets a 409 saying so', async () => {
      const { agent: unlinked } = await signedIn(app, workspace, 'staff');
      const res = await unlinked.post('/api/me/absences').send({ kind: 'annual', startDate: '2027-09-06', endDate: '2027-09-07' });
      expect(res.status).toBe(409);
      expect(res.body.error.message).toMatch(/not linked to a person/);
      expect((await unlinked.get('/api/me/absences')).body.items).toEqual([]);
    });

    it('is refused every coordinator route', async () => {
      const any = (await coordinator.get('/api/absences')).body.items[0];
      const calls = [
        staff.get('/api/absences'),
        staff.post('/api/absences').send({ personId: ines.id, kind: 'annual', startDate: '2027-10-01', endDate: '2027-10-01' }),
        staff.patch(`/api/absences/${any.id}`).send({ note: 'x', version: any.version }),
        staff.post(`/api/absences/${any.id}/decision`).send({ decision: 'approve', version: any.version }),
        staff.delete(`/api/absences/${any.id}`),
        staff.get('/api/absences/settings'),
        staff.put('/api/absences/settings').send({ credits: { annual: 0, sick: 0, training: 0, parental: 0, other: 0 } }),
        staff.post('/api/absences/import').send({ csv: 'person,kind,start_date,end_date\n' }),
        staff.get('/api/absences/conflicts'),
        staff.post('/api/rosters/1/absence-cover').send({}),
      ];
      const labels = ['GET list', 'POST create', 'PATCH', 'POST decision', 'DELETE', 'GET settings', 'PUT settings', 'POST import', 'GET conflicts', 'POST absence-cover'];
      for (const [i, res] of (await Promise.all(calls)).entries()) {
        expect(res.status, labels[i]).toBe(403);
        expect(res.body.error.code).toBe('forbidden');
      }
      expect(await AbsenceRow.count({ where: { id: any.id } })).toBe(1);
    });
  });

  describe('decisions, and the e-mail to the person', () => {
    const pending = async () => (await coordinator.get('/api/absences?status=requested')).body.items as Array<{ id: number; version: number; personId: number }>;

    it('declining tells the person why (at their login address when they have none of their own)', async () => {
      const [request] = await pending();
      const before = mailer.outbox.length;
      const res = await coordinator.post(`/api/absences/${request.id}/decision`).send({ decision: 'decline', version: request.version, reason: 'Two others are away that week' });
      expect(res.status).toBe(200);
      expect(res.body).toMatchObject({ status: 'declined', declineReason: 'Two others are away that week', decidedByName: 'Fixture Person', version: request.version + 1, mail: { to: staffEmail, sent: true } });
      expect(mailer.outbox).toHaveLength(before + 1);
      const mail = mailer.last(staffEmail)!;
      expect(mail.subject).toBe('Your absence was declined: annual leave from Mon 6 Sep to Fri 10 Sep');
      expect(mail.text).toContain('The reason given: Two others are away that week');
      expect(mail.html).toContain('Larkspur Ward');
      // The same decision again (a second click with the new version) changes nothing and mails nobody.
      const again = await coordinator.post(`/api/absences/${request.id}/decision`).send({ decision: 'decline', version: res.body.version });
      expect(again.body.mail).toEqual({ to: null, sent: false });
      expect(mailer.outbox).toHaveLength(before + 1);
      // A declined request no longer blocks the dates.
      const retry = await staff.post('/api/me/absences').send({ kind: 'annual', startDate: '2027-09-08', endDate: '2027-09-09' });
      expect(retry.status).toBe(201);
    });

    it('approving mails the person; a stale version is a 409; re-approving a declined one re-checks overlaps', async () => {
      const [request] = await pending();
      const stale = await coordinator.post(`/api/absences/${request.id}/decision`).send({ decision: 'approve', version: request.version + 5 });
      expect(stale.status).toBe(409);
      expect(stale.body.error.fields[0].path).toBe('body.version');
      const res = await coordinator.post(`/api/absences/${request.id}/decision`).send({ decision: 'approve', version: request.version });
      expect(res.status).toBe(200);
      expect(res.body).toMatchObject({ status: 'approved', declineReason: null, mail: { to: staffEmail, sent: true } });
      expect(mailer.last(staffEmail)!.subject).toBe('Your absence was approved: annual leave from Wed 8 Sep to Thu 9 Sep');
      // The declined 6–10 September request now overlaps an approved one.
      const declined = (await coordinator.get('/api/absences?status=declined')).body.items[0];
      const back = await coordinator.post(`/api/absences/${declined.id}/decision`).send({ decision: 'approve', version: declined.version });
      expect(back.status).toBe(409);
      expect(back.body.error.fields[0].path).toBe('body.decision');
    });

    it('a person with no address and no login gets no mail, and the decision stands', async () => {
      const made = await create({ personId: mute.id, kind: 'other', startDate: '2027-11-01', endDate: '2027-11-01' });
      const before = mailer.outbox.length;
      const res = await coordinator.post(`/api/absences/${made.body.id}/decision`).send({ decision: 'decline', version: made.body.version });
      expect(res.status).toBe(200);
      expect(res.body).toMatchObject({ status: 'declined', mail: { to: null, sent: false } });
      expect(mailer.outbox).toHaveLength(before);
    });

    it('a person with their own address is mailed there', async () => {
      const made = await create({ personId: odo.id, kind: 'parental', startDate: '2027-11-01', endDate: '2027-11-05' });
      const res = await coordinator.post(`/api/absences/${made.body.id}/decision`).send({ decision: 'decline', version: made.body.version });
      expect(res.body.mail).toEqual({ to: 'odo.brell@example.test', sent: true });
      expect(mailer.last('odo.brell@example.test')!.subject).toBe('Your absence was declined: parental leave from Mon 1 Nov to Fri 5 Nov');
    });
  });

  it('staff withdraw only what is still requested; coordinators delete anything', async () => {
    const request = await staff.post('/api/me/absences').send({ kind: 'training', startDate: '2027-12-01', endDate: '2027-12-01' });
    expect((await staff.delete(`/api/me/absences/${request.body.id}`)).status).toBe(204);
    expect(await AbsenceRow.count({ where: { id: request.body.id } })).toBe(0);
    const approved = (await staff.get('/api/me/absences')).body.items.find((a: { status: string }) => a.status === 'approved');
    const refused = await staff.delete(`/api/me/absences/${approved.id}`);
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toMatch(/already been approved/);
    const odos = (await coordinator.get(`/api/absences?personId=${odo.id}`)).body.items[0];
    expect((await staff.delete(`/api/me/absences/${odos.id}`)).status).toBe(404);
    expect((await coordinator.delete(`/api/absences/${approved.id}`)).status).toBe(204);
    expect((await coordinator.delete(`/api/absences/${approved.id}`)).status).toBe(404);
  });
});
