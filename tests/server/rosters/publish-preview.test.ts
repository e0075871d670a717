import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, memoryMailer, signedIn } from '../auth/helpers';
import type { Workspace } from '../../../server/db/models';
import { seatsOf } from '../staff/publish-helper';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

/**
 * The confirmation before publishing (issue 20, fix 6) lists who will be e-mailed and whose shifts
 * changed. The check is against what publishing then really does: the mails in the outbox, and
 * the difference of the two runs' seat choices counted here from the assignments themselves.
 */
describe('publish preview API', () => {
  let db: TestDb;
  let app: Express;
  let mailer: ReturnType<typeof memoryMailer>;
  let workspace: Workspace;
  let coordinator: Agent;
  let rosterId: number;
  let people: Array<{ id: number; name: string }>;

  beforeAll(async () => {
    db = await createTestDb();
    const made = makeApp(db);
    app = made.app;
    mailer = made.mailer;
    workspace = await makeWorkspace('Hollinsby Ward');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    people = [];
    for (const [name, email] of [
      ['Corin Ashdown', 'corin@example.test'],
      ['Dalia Fenwick', 'dalia@example.test'],
      ['Eamon Quill', null],
    ] as const) {
      const res = await coordinator.post('/api/people').send({ name, email, contractedHours: 0, skillIds: [] });
      expect(res.status).toBe(201);
      people.push(res.body);
    }
    const roster = await coordinator.post('/api/rosters').send({ name: 'Hollinsby, mid May', periodStart: '2027-05-10', periodEnd: '2027-05-16', timeZone: 'Europe/London' });
    rosterId = roster.body.id;
    const pattern = await coordinator.post(`/api/rosters/${rosterId}/patterns`).send({ label: 'day', weekdays: ['mon', 'tue', 'wed'], startTime: '08:00', endTime: '16:00', seats: [{ skillId: null, count: 1 }] });
    expect(pattern.status).toBe(201);
  });
  afterAll(async () => {
    await db.drop();
  });

  const saveRun = async (choice: Array<number | null>) => {
    const seats = await seatsOf(workspace.id, rosterId);
    const roster = (await coordinator.get(`/api/rosters/${rosterId}`)).body;
    const assignment = Object.fromEntries(seats.map((s, i) => [String(s.seatId), choice[i]]));
    const res = await coordinator.post(`/api/rosters/${rosterId}/manual-runs`).send({ assignment, version: roster.version });
    if (res.status !== 201) throw new Error(JSON.stringify(res.body));
    return res.body.runId as number;
  };
  const publish = async (runId: number) => {
    const roster = (await coordinator.get(`/api/rosters/${rosterId}`)).body;
    const before = mailer.outbox.length;
    const res = await coordinator.post(`/api/rosters/${rosterId}/publish`).send({ runId, version: roster.version });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    return mailer.outbox.slice(before).map((m) => m.to).sort();
  };

  it('names the field when the run is missing or not a number, and 404s a run of nowhere', async () => {
    const missing = await coordinator.get(`/api/rosters/${rosterId}/publish-preview`);
    expect(missing.status).toBe(400);
    expect(missing.body.error.fields[0].path).toBe('query.runId');
    const word = await coordinator.get(`/api/rosters/${rosterId}/publish-preview?runId=seven`);
    expect(word.status).toBe(400);
    expect(word.body.error.fields[0].path).toBe('query.runId');
    expect((await coordinator.get(`/api/rosters/${rosterId}/publish-preview?runId=999999`)).status).toBe(404);
    expect((await coordinator.get(`/api/rosters/999999/publish-preview?runId=1`)).status).toBe(404);
  });

  it('on a first publication lists everyone with a shift, exactly those publishing then mails', async () => {
    // Corin Monday and Wednesday, Eamon (no address) Tuesday, Dalia nothing.
    const runId = await saveRun([people[0].id, people[2].id, people[0].id]);
    const res = await coordinator.get(`/api/rosters/${rosterId}/publish-preview?runId=${runId}`);
    expect(res.status).toBe(200);
    expect(res.body.firstPublication).toBe(true);
    expect(res.body.willMail).toEqual([{ personId: people[0].id, name: 'Corin Ashdown', to: 'corin@example.test', changed: 2 }]);
    expect(res.body.noAddress.map((p: { name: string }) => p.name)).toEqual(['Eamon Quill']);
    expect(res.body.changed.map((p: { name: string; added: number }) => [p.name, p.added])).toEqual([['Corin Ashdown', 2], ['Eamon Quill', 1]]);
    // Nothing was sent by asking.
    expect(mailer.outbox).toHaveLength(0);
    const sent = await publish(runId);
    expect(sent).toEqual(res.body.willMail.map((m: { to: string }) => m.to).sort());
    // A published roster has nothing to preview until it is reopened.
    const again = await coordinator.get(`/api/rosters/${rosterId}/publish-preview?runId=${runId}`);
    expect(again.status).toBe(409);
    expect(again.body.error.fields[0].path).toBe('params.rosterId');
  });

  it('after a reopen lists only the people whose shifts changed, with the counts of the runs’ difference', async () => {
    const roster = (await coordinator.get(`/api/rosters/${rosterId}`)).body;
    const reopened = await coordinator.post(`/api/rosters/${rosterId}/reopen`).send({ version: roster.version });
    expect(reopened.status).toBe(200);
    const old = [people[0].id, people[2].id, people[0].id];
    const next = [people[1].id, people[2].id, people[0].id]; // Monday moves from Corin to Dalia
    const runId = await saveRun(next);
    const res = await coordinator.get(`/api/rosters/${rosterId}/publish-preview?runId=${runId}`);
    expect(res.status).toBe(200);
    expect(res.body.firstPublication).toBe(false);
    // Counted from the two seat lists: per person, seats gained and seats lost.
    const diff = (id: number) => ({ added: next.filter((p, i) => p === id && old[i] !== id).length, removed: old.filter((p, i) => p === id && next[i] !== id).length });
    expect(res.body.changed).toEqual([
      { personId: people[0].id, name: 'Corin Ashdown', ...diff(people[0].id) },
      { personId: people[1].id, name: 'Dalia Fenwick', ...diff(people[1].id) },
    ]);
    expect(res.body.unchanged).toBe(1);
    expect(res.body.noAddress).toEqual([]);
    const sent = await publish(runId);
    expect(sent).toEqual(['corin@example.test', 'dalia@example.test']);
    expect(sent).toEqual(res.body.willMail.map((m: { to: string }) => m.to).sort());
  });

  it('is for coordinators only', async () => {
    const staff = (await signedIn(app, workspace, 'staff')).agent;
    expect((await staff.get(`/api/rosters/${rosterId}/publish-preview?runId=1`)).status).toBe(403);
  });
});
