import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import type { Express } from 'express';
import { parse as parseCsv } from 'csv-parse/sync';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, memoryMailer, signedIn } from '../auth/helpers';
import { Person } from '../../../server/db/models';
import { AssignmentRow, Roster } from '../../../server/rosters/models';
import { assembleRoster } from '../../../server/rosters/assemble';
import { scoreRoster } from '../../../solver/roster';
import type { Roster as RosterJson, RosterAssignment } from '../../../shared/roster/schema';
import { makeApiRoster } from '../rosters/fixtures';
import { publishDirectly, seatsOf } from '../staff/publish-helper';
import { readEvents } from '../helpers/ical-read';
import { publishedWeek } from './fixture';

/** The published filling straight from the assignment rows, in roster JSON ids. */
async function filling(workspaceId: number, rosterId: number): Promise<{ roster: RosterJson; assignment: RosterAssignment }> {
  const { parsed } = await assembleRoster(workspaceId, rosterId);
  if (!parsed.ok) throw new Error('roster does not parse');
  const row = (await Roster.findByPk(rosterId))!;
  const assignment: RosterAssignment = Object.fromEntries(parsed.roster.seats.map((s) => [s.id, null]));
  for (const a of await AssignmentRow.findAll({ where: { runId: row.publishedRunId! } })) assignment[`st${a.seatId}`] = a.personId ? `p${a.personId}` : null;
  return { roster: parsed.roster, assignment };
}

describe('swaps and giveaways on a published roster', () => {
  let db: TestDb;
  let app: Express;
  let mailer: ReturnType<typeof memoryMailer>;
  let w: Awaited<ReturnType<typeof publishedWeek>>;

  beforeAll(async () => {
    db = await createTestDb();
    ({ app, mailer } = makeApp(db));
    w = await publishedWeek(app);
    // The exports' snapshot is kept from the first download on (server/rosters/publish.ts).
    expect((await w.coordinator.get(`/api/rosters/${w.roster.id}/roster.csv`)).status).toBe(200);
  });
  afterAll(async () => {
    await db.drop();
  });

  it('refuses a swap that breaks a hard rule, with the breaches scoreRoster finds on the changed roster', async () => {
    // A's early Tue for B's late Mon: A would work 07–15 and 15–23 on Monday, B 07–15 and 15–23 on Tuesday.
    const body = { kind: 'swap', mySeatId: w.seat('early', '2027-03-02'), colleagueId: w.people.b.id, theirSeatId: w.seat('late', '2027-03-01') };
    const { roster, assignment } = await filling(w.workspace.id, w.roster.id);
    const changed = { ...assignment, [`st${body.mySeatId}`]: `p${w.people.b.id}`, [`st${body.theirSeatId}`]: `p${w.people.a.id}` };
    const had = new Set(scoreRoster(roster, assignment).violations.filter((v) => v.hard).map((v) => v.message));
    const expected = scoreRoster(roster, changed).violations.filter((v) => v.hard && !had.has(v.message)).map((v) => v.message);
    expect(expected.length).toBeGreaterThanOrEqual(2); // one for each of them (Directive 2003/88/EC Art. 3: 11 h daily rest)

    const check = await w.staff.a.post('/api/me/swaps/check').send(body);
    expect(check.status).toBe(200);
    expect(check.body.ok).toBe(false);
    expect(check.body.breaches.sort()).toEqual(expected.sort());
    expect(check.body.words[0]).toMatch(/would break 2 hard rules/);

    const proposed = await w.staff.a.post('/api/me/swaps').send(body);
    expect(proposed.status).toBe(422);
    expect(proposed.body.error.fields.map((f: { path: string }) => f.path)).toContain('body.theirSeatId');
    expect(proposed.body.error.fields.map((f: { message: string }) => f.message).sort()).toEqual(expected.sort());
    expect((await w.staff.a.get('/api/me/swaps')).body.items).toEqual([]);
  });

  it('answers bad proposals with a 4xx naming the field, and stores nothing', async () => {
    const other = await makeWorkspace('Another house');
    const stranger = await Person.create({ workspaceId: other.id, name: 'Stranger Fen', contractedHours: 30, skills: [] });
    const draft = await makeApiRoster(w.coordinator, w.workspace, { people: 1 });
    const draftSeat = (await seatsOf(w.workspace.id, draft.roster.id))[0].seatId;
    // A published roster from the past (November 2026, before today).
    const past = await makeApiRoster(w.coordinator, w.workspace, { people: 1, periodStart: '2026-11-02', periodEnd: '2026-11-06' });
    const pastSeat = (await seatsOf(w.workspace.id, past.roster.id))[0].seatId;
    await publishDirectly(w.workspace.id, past.roster.id, [{ seatId: pastSeat, personId: w.people.a.id }]);
    const mine = w.seat('early', '2027-03-01');
    const cases: Array<[Record<string, unknown>, number, string]> = [
      [{ kind: 'giveaway', mySeatId: draftSeat, colleagueId: w.people.c.id }, 422, 'body.mySeatId'], // unpublished roster
      [{ kind: 'giveaway', mySeatId: mine, colleagueId: stranger.id }, 422, 'body.colleagueId'], // another workspace's person
      [{ kind: 'giveaway', mySeatId: pastSeat, colleagueId: w.people.c.id }, 422, 'body.mySeatId'], // past shift
      [{ kind: 'swap', mySeatId: mine, colleagueId: w.people.c.id }, 400, 'body.theirSeatId'],
      [{ kind: 'swap', mySeatId: mine, colleagueId: w.people.c.id, theirSeatId: w.seat('late', '2027-03-04') }, 422, 'body.theirSeatId'], // D's shift, not C's
      [{ kind: 'giveaway', mySeatId: w.seat('late', '2027-03-01'), colleagueId: w.people.c.id }, 422, 'body.mySeatId'], // B's shift, not A's
      [{ kind: 'giveaway', mySeatId: mine, colleagueId: w.people.a.id }, 422, 'body.colleagueId'],
      [{ kind: 'trade', mySeatId: mine, colleagueId: w.people.c.id }, 400, 'body.kind'],
      [{ kind: 'giveaway', mySeatId: 'x', colleagueId: w.people.c.id }, 400, 'body.mySeatId'],
    ];
    for (const [body, status, field] of cases) {
      const res = await w.staff.a.post('/api/me/swaps').send(body);
      expect(res.status, JSON.stringify(body)).toBe(status);
      expect(res.body.error.fields.map((f: { path: string }) => f.path), JSON.stringify(body)).toContain(field);
    }
    expect((await w.staff.a.get('/api/me/swaps')).body.items).toEqual([]);
    expect((await w.staff.a.post('/api/me/swaps/999999/accept').send({ version: 1 })).status).toBe(404);
  });

  it('swaps two shifts: proposed, accepted by the colleague (once, under a race), approved with one tap; roster, snapshot, mails and feeds follow', async () => {
    const feed = await w.staff.a.post('/api/me/feed');
    const feedPath = new URL(feed.body.url).pathname;
    const feedBefore = readEvents((await request(app).get(feedPath)).text);
    // A name changed after publishing stays as published in the roster's files (docs/security.md).
    await Person.update({ name: 'Renamed Later' }, { where: { id: w.people.d.id } });

    const body = { kind: 'swap', mySeatId: w.seat('early', '2027-03-02'), colleagueId: w.people.c.id, theirSeatId: w.seat('early', '2027-03-03') };
    const { roster, assignment } = await filling(w.workspace.id, w.roster.id);
    const before = scoreRoster(roster, assignment);
    const after = scoreRoster(roster, { ...assignment, [`st${body.mySeatId}`]: `p${w.people.c.id}`, [`st${body.theirSeatId}`]: `p${w.people.a.id}` });
    const proposed = await w.staff.a.post('/api/me/swaps').send(body);
    expect(proposed.status).toBe(201);
    expect(proposed.body).toMatchObject({ kind: 'swap', status: 'proposed', proposer: { id: w.people.a.id }, colleague: { id: w.people.c.id } });
    expect(proposed.body.check.ok).toBe(true);
    expect(proposed.body.check.scoreBefore).toBeCloseTo(before.softTotal, 6);
    expect(proposed.body.check.scoreAfter).toBeCloseTo(after.softTotal, 6);

    // Only the colleague asked can accept; the coordinator cannot approve before they do.
    expect((await w.staff.b.post(`/api/me/swaps/${proposed.body.id}/accept`).send({ version: 1 })).status).toBe(403);
    expect((await w.coordinator.post(`/api/swaps/${proposed.body.id}/decision`).send({ decision: 'approve', version: 1 })).status).toBe(409);
    const race = await Promise.all([1, 2, 3].map(() => w.staff.c.post(`/api/me/swaps/${proposed.body.id}/accept`).send({ version: 1 })));
    expect(race.map((r) => r.status).sort()).toEqual([200, 409, 409]);

    const listed = await w.coordinator.get('/api/swaps').query({ status: 'accepted' });
    expect(listed.body.items.map((s: { id: number }) => s.id)).toEqual([proposed.body.id]);
    const outboxBefore = mailer.outbox.length;
    const approvals = await Promise.all([1, 2].map(() => w.coordinator.post(`/api/swaps/${proposed.body.id}/decision`).send({ decision: 'approve', version: 2 })));
    expect(approvals.map((r) => r.status).sort()).toEqual([200, 409]);
    const approved = approvals.find((r) => r.status === 200)!.body;
    expect(approved.swap.status).toBe('approved');

    // The published run now holds the swapped seats, nothing else moved.
    const now = await filling(w.workspace.id, w.roster.id);
    expect(now.assignment).toEqual({ ...assignment, [`st${body.mySeatId}`]: `p${w.people.c.id}`, [`st${body.theirSeatId}`]: `p${w.people.a.id}` });
    // Both are mailed, no one else.
    const sent = mailer.outbox.slice(outboxBefore);
    expect(sent.map((m) => m.to).sort()).toEqual([w.emails.a, w.emails.c].sort());
    expect(sent.find((m) => m.to === w.emails.a)!.text).toContain('You work Wed 3 Mar 2027, early 07:00–15:00 instead'); // wording: tests/server/swaps/approval-mail.test.ts
    // The roster's CSV comes from the moved-on snapshot: the swap shows, the later rename does not.
    const csv = parseCsv((await w.coordinator.get(`/api/rosters/${w.roster.id}/roster.csv`)).text) as string[][];
    const rows = csv.slice(1).map((r) => r.join(' '));
    expect(rows.some((r) => r.includes('2027-03-02') && r.includes('early') && r.includes(w.people.c.name))).toBe(true);
    expect(rows.some((r) => r.includes('2027-03-03') && r.includes('early') && r.includes(w.people.a.name))).toBe(true);
    expect(rows.some((r) => r.includes(w.people.d.name))).toBe(true);
    expect(rows.some((r) => r.includes('Renamed Later'))).toBe(false);
    // A's feed (read by ical.js): Tuesday's seat is gone, Wednesday's came, and every SEQUENCE went up (RFC 5545 §3.8.7.4).
    const feedAfter = readEvents((await request(app).get(feedPath)).text);
    expect(feedAfter.map((e) => e.start.slice(0, 10)).filter((d) => d >= '2027').sort()).toEqual(['2027-03-01', '2027-03-03']);
    const kept = feedAfter.find((e) => e.start.startsWith('2027-03-01'))!;
    expect(kept.sequence).toBeGreaterThan(feedBefore.find((e) => e.uid === kept.uid)!.sequence);
    expect(feedAfter.find((e) => e.start.startsWith('2027-03-03'))!.sequence).toBeGreaterThan(Math.max(...feedBefore.map((e) => e.sequence)));
  });

  it('a giveaway states the score change term by term as scoreRoster has it; a proposal made stale by another change is refused at approval', async () => {
    const { roster, assignment } = await filling(w.workspace.id, w.roster.id);
    const body = { kind: 'giveaway', mySeatId: w.seat('late', '2027-03-04'), colleagueId: w.people.b.id };
    const before = scoreRoster(roster, assignment);
    const after = scoreRoster(roster, { ...assignment, [`st${body.mySeatId}`]: `p${w.people.b.id}` });
    const moved = Object.keys(after.terms).filter((t) => Math.abs((after.terms as Record<string, number>)[t] - (before.terms as Record<string, number>)[t]) > 1e-9);
    const check = (await w.staff.d.post('/api/me/swaps/check').send(body)).body;
    expect(check.ok).toBe(true);
    expect(check.termChanges.map((t: { term: string }) => t.term).sort()).toEqual(moved.sort());
    for (const t of check.termChanges) expect(t.points).toBeCloseTo((after.terms as Record<string, number>)[t.term] - (before.terms as Record<string, number>)[t.term], 6);
    expect(moved).toContain('contractedHours'); // D drops to 8 h against a 30 h week

    const first = (await w.staff.d.post('/api/me/swaps').send(body)).body;
    const second = (await w.staff.d.post('/api/me/swaps').send({ ...body, colleagueId: w.people.a.id })).body;
    expect(second.check.ok).toBe(true);
    expect((await w.staff.b.post(`/api/me/swaps/${first.id}/accept`).send({ version: 1 })).status).toBe(200);
    expect((await w.staff.a.post(`/api/me/swaps/${second.id}/accept`).send({ version: 1 })).status).toBe(200);
    expect((await w.coordinator.post(`/api/swaps/${first.id}/decision`).send({ decision: 'approve', version: 2 })).status).toBe(200);
    const stale = await w.coordinator.post(`/api/swaps/${second.id}/decision`).send({ decision: 'approve', version: 2 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.message).toMatch(/changed since this was proposed/);
    expect((await w.coordinator.post(`/api/swaps/${second.id}/decision`).send({ decision: 'refuse', version: 2 })).status).toBe(200);
    expect((await w.staff.d.post(`/api/me/swaps/${second.id}/withdraw`).send({ version: 3 })).status).toBe(409);
    expect((await w.coordinator.post(`/api/swaps/${second.id}/decision`).send({ decision: 'maybe', version: 3 })).body.error.fields[0].path).toBe('body.decision');
  });

  it('keeps other workspaces out: their coordinator gets a 404, their staff see none of it', async () => {
    const other = await makeWorkspace('Elsewhere');
    const them = (await signedIn(app, other, 'coordinator')).agent;
    const mine = (await w.coordinator.get('/api/swaps')).body.items;
    expect(mine.length).toBeGreaterThan(0);
    expect((await them.get('/api/swaps')).body.items).toEqual([]);
    expect((await them.post(`/api/swaps/${mine[0].id}/decision`).send({ decision: 'refuse', version: mine[0].version })).status).toBe(404);
  });
});
