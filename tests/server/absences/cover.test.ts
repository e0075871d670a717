import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import type { Workspace } from '../../../server/db/models';
import { Roster } from '../../../server/rosters/models';
import { RunWorker } from '../../../server/runs/worker';
import { makeApiRoster } from '../rosters/fixtures';
import { seatsOf } from '../staff/publish-helper';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];
type Seat = { seatId: number; personId: number | null; pinned: boolean };

/**
 * Absences meeting rosters: the roster JSON, conflicts with a published roster, and the cover
 * re-solve. The fixture roster runs Mon 1 – Sun 7 March 2027 (1 March 2027 is a Monday) with an
 * early shift 07:00–15:00 Monday to Friday, two seats each; six people on 30 contracted hours.
 */
describe('absences in rosters: roster JSON, conflicts, cover', () => {
  let db: TestDb;
  let app: Express;
  let workspace: Workspace;
  let coordinator: Agent;
  let worker: RunWorker;
  let rosterId: number;
  let people: Array<{ id: number; name: string }>;
  let published: { id: number; assignments: Seat[] };

  const solve = async (path: string, body: Record<string, unknown> = { timeLimitSeconds: 1, seed: 1 }) => {
    const start = await coordinator.post(path).send(body);
    expect(start.status, JSON.stringify(start.body)).toBe(202);
    const runId = start.body.runId ?? start.body.id;
    expect(await worker.tick()).toBe(runId);
    const run = await coordinator.get(`/api/runs/${runId}`);
    expect(run.body.status).toBe('done');
    return { start: start.body, run: run.body as { id: number; assignments: Seat[]; result: { feasible: boolean } } };
  };
  const exported = async () => (await coordinator.get(`/api/rosters/${rosterId}/export`)).body as { absences: Array<Record<string, unknown>> };
  const absent = (body: Record<string, unknown>) => coordinator.post('/api/absences').send(body);

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    workspace = await makeWorkspace('Hollin Mews');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    worker = new RunWorker(db.sequelize, { name: 'absence-cover-test' });
    const fixture = await makeApiRoster(coordinator, workspace);
    rosterId = fixture.roster.id;
    people = fixture.people;
  });
  afterAll(async () => {
    await worker.stop();
    await db.drop();
  });

  it('puts approved absences touching the period into the roster JSON, clipped, with the hours credited inside it', async () => {
    const [a, b, c] = people;
    // Sun 28 Feb – Tue 2 Mar: clipped to Mon 00:00 – Wed 00:00; Mon and Tue at 30/5 = 6 h.
    expect((await absent({ personId: a.id, kind: 'annual', startDate: '2027-02-28', endDate: '2027-03-02' })).status).toBe(201);
    // Part day Thu 4 Mar 10:00–12:00: 2 h.
    expect((await absent({ personId: b.id, kind: 'training', startDate: '2027-03-04', endDate: '2027-03-04', startTime: '10:00', endTime: '12:00' })).status).toBe(201);
    // Sat 6 – Tue 9 Mar with 8 h entered: clipped at Mon 8 Mar 00:00; 2 of its 4 days fall inside: 4 h.
    expect((await absent({ personId: c.id, kind: 'other', startDate: '2027-03-06', endDate: '2027-03-09', creditHours: 8 })).status).toBe(201);
    // Outside the period, and a request not yet approved: neither reaches the roster.
    expect((await absent({ personId: a.id, kind: 'annual', startDate: '2027-03-08', endDate: '2027-03-09' })).status).toBe(201);
    const staffLike = await absent({ personId: b.id, kind: 'sick', startDate: '2027-03-05', endDate: '2027-03-05' });
    await coordinator.post(`/api/absences/${staffLike.body.id}/decision`).send({ decision: 'decline', version: staffLike.body.version });

    expect((await exported()).absences).toEqual([
      { person: `p${a.id}`, kind: 'annual', start: '2027-03-01T00:00', end: '2027-03-03T00:00', creditHours: 12 },
      { person: `p${b.id}`, kind: 'training', start: '2027-03-04T10:00', end: '2027-03-04T12:00', creditHours: 2 },
      { person: `p${c.id}`, kind: 'other', start: '2027-03-06T00:00', end: '2027-03-08T00:00', creditHours: 4 },
    ]);
    // Cleared again so the solve below has everyone available.
    for (const x of (await coordinator.get('/api/absences')).body.items) expect((await coordinator.delete(`/api/absences/${x.id}`)).status).toBe(204);
    expect((await exported()).absences).toEqual([]);
  });

  it('has nothing to cover before an absence takes a seat (409 in words)', async () => {
    const draft = await coordinator.post(`/api/rosters/${rosterId}/absence-cover`).send({});
    expect(draft.status).toBe(409);
    expect(draft.body.error.message).toMatch(/not been solved yet/);
    const { run } = await solve(`/api/rosters/${rosterId}/runs`);
    expect(run.result.feasible).toBe(true);
    const roster = await Roster.findByPk(rosterId);
    const pub = await coordinator.post(`/api/rosters/${rosterId}/publish`).send({ runId: run.id, version: roster!.version });
    expect(pub.status, JSON.stringify(pub.body)).toBe(200);
    published = run;
    const none = await coordinator.post(`/api/rosters/${rosterId}/absence-cover`).send({});
    expect(none.status).toBe(409);
    expect(none.body.error.message).toBe('No approved absence takes a seat of this roster: nothing needs cover.');
    expect((await Roster.findByPk(rosterId))!.status).toBe('published');
    expect((await coordinator.get('/api/absences/conflicts')).body.items).toEqual([]);
  });

  it('lists the published seats an approved absence takes away, in words', async () => {
    // Whoever works Friday's early first seat falls ill for Friday.
    const fridaySeats = (await seatsOf(workspace.id, rosterId)).filter((s) => s.startsLocal.startsWith('2027-03-05'));
    const seat = published.assignments.find((a) => fridaySeats.some((s) => s.seatId === a.seatId) && a.personId !== null)!;
    const friday = { id: fridaySeats[0].shiftId };
    const person = people.find((p) => p.id === seat.personId)!;
    const sick = await absent({ personId: person.id, kind: 'sick', startDate: '2027-03-05', endDate: '2027-03-05' });
    expect(sick.status).toBe(201);
    // A declined absence is no time away: Thursday's holder stays where they are.
    const thursday = (await seatsOf(workspace.id, rosterId)).filter((s) => s.startsLocal.startsWith('2027-03-04'));
    const thursdayHolder = published.assignments.find((a) => thursday.some((s) => s.seatId === a.seatId) && a.personId !== null && a.personId !== person.id)!;
    const declined = await absent({ personId: thursdayHolder.personId, kind: 'annual', startDate: '2027-03-04', endDate: '2027-03-04' });
    expect((await coordinator.post(`/api/absences/${declined.body.id}/decision`).send({ decision: 'decline', version: declined.body.version })).status).toBe(200);
    const conflicts = (await coordinator.get('/api/absences/conflicts')).body.items;
    expect(conflicts).toEqual([
      { absenceId: sick.body.id, personId: person.id, personName: person.name, rosterId, rosterName: 'Test roster', seatId: seat.seatId, shiftId: friday.id, shiftLabel: 'early', date: '2027-03-05', message: `${person.name} is sick on Fri 5 Mar; their early shift needs cover` },
    ]);
  });

  it('re-solves with every other seat pinned, reopening the published roster, and the absent person is off the freed seat', async () => {
    const [conflict] = (await coordinator.get('/api/absences/conflicts')).body.items;
    const { start, run } = await solve(`/api/rosters/${rosterId}/absence-cover`, { timeLimitSeconds: 1 });
    expect(start.freedSeatIds).toEqual([conflict.seatId]);
    expect((await Roster.findByPk(rosterId))!.status).toBe('solved');
    const before = new Map(published.assignments.map((a) => [a.seatId, a.personId]));
    for (const a of run.assignments) {
      if (a.seatId === conflict.seatId) {
        expect(a.personId).not.toBe(conflict.personId);
        expect(a.pinned).toBe(false);
      } else {
        expect({ seat: a.seatId, person: a.personId, pinned: a.pinned }).toEqual({ seat: a.seatId, person: before.get(a.seatId), pinned: true });
      }
    }
    expect(run.assignments).toHaveLength(published.assignments.length);
    // The latest solved run now covers the seat, so nothing conflicts any more.
    expect((await coordinator.get('/api/absences/conflicts')).body.items).toEqual([]);
    const again = await coordinator.post(`/api/rosters/${rosterId}/absence-cover`).send({});
    expect(again.status).toBe(409);
  });

  it('keeps other workspaces out', async () => {
    const other = await makeWorkspace('Farrow Close');
    const outsider = (await signedIn(app, other, 'coordinator')).agent;
    expect((await outsider.post(`/api/rosters/${rosterId}/absence-cover`).send({})).status).toBe(404);
    expect((await outsider.get('/api/absences/conflicts')).body.items).toEqual([]);
  });
});
