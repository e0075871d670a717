import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makePerson, makeWorkspace, signedIn } from '../auth/helpers';
import { makeApiRoster } from './fixtures';
import { seatsOf } from '../staff/publish-helper';
import { PairingRow, PinRow, Roster, ShiftPatternRow, ShiftRow } from '../../../server/rosters/models';
import { CalendarFeedRow } from '../../../server/staff/models';
import type { Workspace } from '../../../server/db/models';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];
const N = 10;
const statuses = (rs: Array<{ status: number }>) => rs.map((r) => r.status).sort();

/**
 * Simultaneous requests (issue 13, item 3): each race answers 2xx or 409, never 500, and leaves
 * exactly the rows one request would have made. Fired together with Promise.all over a pool of
 * 25 connections, so InnoDB really interleaves them.
 */
describe('no 500 from two requests at once', () => {
  let db: TestDb;
  let app: Express;
  let workspace: Workspace;
  let coordinator: Agent;
  let fixture: Awaited<ReturnType<typeof makeApiRoster>>;

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    workspace = await makeWorkspace('Race Lane Lab');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    fixture = await makeApiRoster(coordinator, workspace, { people: 4 });
  });
  afterAll(async () => {
    await db.drop();
  });

  it('8 simultaneous shift creates on one roster all succeed (no deadlock 500s) and move the version on 8 times', async () => {
    const before = (await Roster.findByPk(fixture.roster.id))!.version;
    const count = await ShiftRow.count({ where: { rosterId: fixture.roster.id } });
    const res = await Promise.all(
      Array.from({ length: 8 }, (_, i) => coordinator.post(`/api/rosters/${fixture.roster.id}/shifts`).send({ label: `extra ${i}`, startsLocal: '2027-03-06T09:00', endsLocal: '2027-03-06T17:00', seats: [{ skillId: null }, { skillId: null }] })),
    );
    expect(statuses(res)).toEqual(Array(8).fill(201));
    expect(await ShiftRow.count({ where: { rosterId: fixture.roster.id } })).toBe(count + 8);
    expect((await Roster.findByPk(fixture.roster.id))!.version).toBe(before + 8);
  });

  it('mixed edits of one roster at once (shift edits, deletes, pattern creates, wishes) never answer 500', async () => {
    const shifts = (await coordinator.get(`/api/rosters/${fixture.roster.id}/shifts`)).body.items.filter((s: { label: string }) => s.label.startsWith('extra'));
    const res = await Promise.all([
      ...shifts.slice(0, 4).map((s: { id: number; version: number }) => coordinator.patch(`/api/rosters/${fixture.roster.id}/shifts/${s.id}`).send({ version: s.version, label: 'moved', seats: [{ skillId: null }] })),
      ...shifts.slice(4).map((s: { id: number }) => coordinator.delete(`/api/rosters/${fixture.roster.id}/shifts/${s.id}`)),
      ...[0, 1, 2].map((i) => coordinator.post(`/api/rosters/${fixture.roster.id}/patterns`).send({ label: `mixed ${i}`, weekdays: ['sat'], startTime: '08:00', endTime: '12:00', seats: [{ skillId: null, count: 1 }] })),
      ...[2, 3, 4].map((d) => coordinator.post(`/api/rosters/${fixture.roster.id}/wishes`).send({ personId: fixture.people[0].id, date: `2027-03-0${d}`, kind: 'avoid' })),
    ]);
    expect(res.filter((r) => r.status >= 500).map((r) => r.body)).toEqual([]);
    expect(res.every((r) => r.status < 300)).toBe(true);
  });

  it('10 identical pattern creates make one pattern (unique label); the rest hear 409', async () => {
    const body = { label: 'night', weekdays: ['mon', 'tue'], startTime: '22:00', endTime: '07:00', seats: [{ skillId: null, count: 1 }] };
    const res = await Promise.all(Array.from({ length: N }, () => coordinator.post(`/api/rosters/${fixture.roster.id}/patterns`).send(body)));
    expect(statuses(res)).toEqual([201, ...Array(N - 1).fill(409)]);
    expect(await ShiftPatternRow.count({ where: { rosterId: fixture.roster.id, label: 'night' } })).toBe(1);
    expect(await ShiftRow.count({ where: { rosterId: fixture.roster.id, label: 'night' } })).toBe(2);
  });

  it('10 identical pin PUTs all answer 200 and leave one pin', async () => {
    const seat = (await seatsOf(workspace.id, fixture.roster.id))[0];
    const res = await Promise.all(Array.from({ length: N }, () => coordinator.put(`/api/rosters/${fixture.roster.id}/pins`).send({ seatId: seat.seatId, personId: fixture.people[0].id })));
    expect(statuses(res)).toEqual(Array(N).fill(200));
    expect(await PinRow.count({ where: { seatId: seat.seatId } })).toBe(1);
  });

  it('10 identical pairing creates make one pairing; the rest hear 409', async () => {
    const res = await Promise.all(Array.from({ length: N }, () => coordinator.post('/api/pairings').send({ personAId: fixture.people[1].id, personBId: fixture.people[2].id, score: 4 })));
    expect(statuses(res)).toEqual([201, ...Array(N - 1).fill(409)]);
    expect(await PairingRow.count({ where: { workspaceId: workspace.id } })).toBe(1);
  });

  it('10 identical staff pairing requests and 10 feed resets at once: one request, one feed, no 500', async () => {
    const { agent: staff, user } = await signedIn(app, workspace, 'staff');
    await makePerson(workspace, { name: 'Staff Racer', userId: user.id });
    const colleague = fixture.people[3].id;
    const asked = await Promise.all(Array.from({ length: N }, () => staff.post('/api/me/pairings').send({ colleagueId: colleague, together: true, reason: 'we cover each other' })));
    expect(statuses(asked)).toEqual([201, ...Array(N - 1).fill(409)]);
    expect(await PairingRow.count({ where: { workspaceId: workspace.id, status: 'requested' } })).toBe(1);

    const feeds = await Promise.all(Array.from({ length: N }, () => staff.post('/api/me/feed')));
    expect(statuses(feeds)).toEqual(Array(N).fill(201));
    expect(await CalendarFeedRow.count({ where: { workspaceId: workspace.id } })).toBe(1);
    // Resets replace one another in turn: exactly one of the ten addresses still opens the calendar.
    const opened = await Promise.all(feeds.map((f) => coordinator.get(new URL(f.body.url).pathname)));
    expect(opened.filter((r) => r.status === 200)).toHaveLength(1);
  });
});
