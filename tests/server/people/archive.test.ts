import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { QueryTypes } from 'sequelize';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import { makeApiRoster } from '../rosters/fixtures';
import { seatsOf } from '../staff/publish-helper';
import { Person, Workspace } from '../../../server/db/models';
import { AssignmentRow, Roster, RunRow } from '../../../server/rosters/models';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

/** A finished, feasible run with the given seats filled, as the worker would leave it. */
async function finishedRun(workspaceId: number, rosterId: number, fill: Array<{ seatId: number; personId: number }>) {
  const roster = (await Roster.findByPk(rosterId))!;
  const run = await RunRow.create({ workspaceId, rosterId, status: 'done', parameters: { timeLimitSeconds: 1, seed: 1 }, rosterVersion: roster.version, startedAt: new Date(), finishedAt: new Date(), result: { feasible: true } as object });
  await AssignmentRow.bulkCreate(fill.map((f) => ({ workspaceId, runId: run.id, seatId: f.seatId, personId: f.personId, pinned: false })));
  return run.id;
}

describe('deleting a person never changes a published roster (issue 13, item 1)', () => {
  let db: TestDb;
  let app: Express;
  let coordinator: Agent;
  let workspace: Workspace;
  let fixture: Awaited<ReturnType<typeof makeApiRoster>>;
  let runId: number;

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    workspace = await makeWorkspace('Larkfield Clinic');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    fixture = await makeApiRoster(coordinator, workspace, { people: 4 });
    const seats = await seatsOf(workspace.id, fixture.roster.id);
    // Person A (first aid) takes every first seat, B every second: both are in the published roster.
    runId = await finishedRun(workspace.id, fixture.roster.id, seats.map((s) => ({ seatId: s.seatId, personId: s.position === 0 ? fixture.people[0].id : fixture.people[1].id })));
    const roster = (await coordinator.get(`/api/rosters/${fixture.roster.id}`)).body;
    const published = await coordinator.post(`/api/rosters/${fixture.roster.id}/publish`).send({ runId, version: roster.version });
    expect(published.status).toBe(200);
  });
  afterAll(async () => {
    await db.drop();
  });

  it('references people from assignments with RESTRICT, so the database itself refuses to drop rows of a roster', async () => {
    const [rule] = await db.sequelize.query<{ rule: string }>(
      `SELECT DELETE_RULE AS rule FROM information_schema.REFERENTIAL_CONSTRAINTS rc
         JOIN information_schema.KEY_COLUMN_USAGE k ON k.CONSTRAINT_NAME = rc.CONSTRAINT_NAME AND k.CONSTRAINT_SCHEMA = rc.CONSTRAINT_SCHEMA
        WHERE rc.CONSTRAINT_SCHEMA = DATABASE() AND k.TABLE_NAME = 'assignments' AND k.COLUMN_NAME = 'person_id'`,
      { type: QueryTypes.SELECT },
    );
    expect(rule.rule).toBe('RESTRICT');
    await expect(Person.destroy({ where: { id: fixture.people[0].id } })).rejects.toThrow(/foreign key/i);
  });

  it('keeps the published CSV and iCalendar files byte for byte after people are renamed and archived and shifts edited', async () => {
    const rosterId = fixture.roster.id;
    const files = async () => {
      const out: string[] = [];
      for (const url of [`roster.csv`, `roster.ics`, `roster.csv?personId=${fixture.people[1].id}`, `roster.ics?personId=${fixture.people[1].id}`]) {
        const res = await coordinator.get(`/api/rosters/${rosterId}/${url}`).buffer(true).parse((r, cb) => {
          const chunks: Buffer[] = [];
          r.on('data', (c: Buffer) => chunks.push(c));
          r.on('end', () => cb(null, Buffer.concat(chunks)));
        });
        expect(res.status).toBe(200);
        out.push(`${res.headers['content-disposition']}\n${(res.body as Buffer).toString('base64')}`);
      }
      return out;
    };
    const before = await files();
    const csvRows = Buffer.from(before[0].split('\n')[1], 'base64').toString('utf8').trim().split('\r\n').length;
    expect(csvRows).toBe(1 + 10); // header + 5 days × 2 seats
    await new Promise((r) => setTimeout(r, 1100)); // a DTSTAMP of "now" would differ by now

    const b = (await coordinator.get(`/api/people/${fixture.people[1].id}`)).body;
    expect((await coordinator.patch(`/api/people/${b.id}`).send({ version: b.version, name: 'Renamed Person' })).status).toBe(200);
    const del = await coordinator.delete(`/api/people/${fixture.people[0].id}`);
    expect(del.status).toBe(200);
    expect(del.body).toMatchObject({ outcome: 'archived', rosters: [{ id: rosterId, name: 'Test roster', status: 'published' }] });
    await Workspace.update({ name: 'Larkfield Clinic (renamed)' }, { where: { id: workspace.id } });
    // Reopened, the roster's shifts can be edited; the publication still stands until the next publish.
    const roster = (await coordinator.get(`/api/rosters/${rosterId}`)).body;
    expect((await coordinator.post(`/api/rosters/${rosterId}/reopen`).send({ version: roster.version })).status).toBe(200);
    const shift = (await coordinator.get(`/api/rosters/${rosterId}/shifts`)).body.items[0];
    expect((await coordinator.patch(`/api/rosters/${rosterId}/shifts/${shift.id}`).send({ version: shift.version, label: 'late', startsLocal: shift.startsLocal.slice(0, 11) + '08:00' })).status).toBe(200);

    expect(await files()).toEqual(before);
  });

  it('hides an archived person from lists, exports and new rosters, and keeps them in run results', async () => {
    const archivedId = fixture.people[0].id;
    const list = (await coordinator.get('/api/people')).body.items.map((p: { id: number }) => p.id);
    expect(list).not.toContain(archivedId);
    const archived = (await coordinator.get('/api/people?archived=true')).body;
    expect(archived.items.map((p: { id: number; archivedAt: string | null }) => [p.id, typeof p.archivedAt])).toEqual([[archivedId, 'string']]);
    const csv = (await coordinator.get('/api/people/export')).text;
    expect(csv).not.toContain(fixture.people[0].name);
    expect(csv).toContain('Renamed Person');
    // A new roster is assembled without them.
    const assembled = (await coordinator.get(`/api/rosters/${fixture.roster.id}/export`)).body;
    expect(assembled.people.map((p: { id: string }) => p.id)).not.toContain(`p${archivedId}`);
    // The run's own result (export of that run by id) still names them.
    const runCsv = (await coordinator.get(`/api/rosters/${fixture.roster.id}/roster.csv?runId=${runId}`)).text;
    expect(runCsv).toContain(fixture.people[0].name);
    // And they cannot be given new wishes.
    const wish = await coordinator.post(`/api/rosters/${fixture.roster.id}/wishes`).send({ personId: archivedId, date: '2027-03-02', kind: 'prefer' });
    expect(wish.status).toBe(422);
  });

  it('refuses with 409 naming the roster when archiving is not wanted, deletes a person never rostered, and restores an archived one', async () => {
    const b = fixture.people[1].id;
    const refused = await coordinator.delete(`/api/people/${b}?archive=false`);
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toContain('"Test roster"');
    expect(refused.body.error.fields[0].path).toBe('query.archive');
    expect((await Person.findByPk(b))!.archivedAt).toBeNull();

    const never = fixture.people[3].id;
    expect((await coordinator.delete(`/api/people/${never}?archive=false`)).status).toBe(204);
    expect(await Person.findByPk(never)).toBeNull();

    const a = (await coordinator.get(`/api/people/${fixture.people[0].id}`)).body;
    const stale = await coordinator.post(`/api/people/${a.id}/restore`).send({ version: a.version - 1 });
    expect(stale.status).toBe(409);
    const restored = await coordinator.post(`/api/people/${a.id}/restore`).send({ version: a.version });
    expect(restored.status).toBe(200);
    expect(restored.body.archivedAt).toBeNull();
    expect((await coordinator.get('/api/people')).body.items.map((p: { id: number }) => p.id)).toContain(a.id);
    expect((await coordinator.post(`/api/people/${a.id}/restore`).send({ version: restored.body.version })).status).toBe(409);
  });
});
