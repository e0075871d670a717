import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, memoryMailer, signedIn } from '../auth/helpers';
import { AssignmentRow, Roster } from '../../../server/rosters/models';
import { assembleRoster } from '../../../server/rosters/assemble';
import { scoreRoster } from '../../../solver/roster';
import type { RosterAssignment } from '../../../shared/roster/schema';
import { makeApiRoster } from '../rosters/fixtures';
import { seatsOf } from '../staff/publish-helper';
import { publishedWeek } from '../swaps/fixture';

describe('open shifts: a seat offered to the eligible staff, the first taker gets it after approval', () => {
  let db: TestDb;
  let app: Express;
  let mailer: ReturnType<typeof memoryMailer>;
  let w: Awaited<ReturnType<typeof publishedWeek>>;
  let seatId: number;

  beforeAll(async () => {
    db = await createTestDb();
    ({ app, mailer } = makeApp(db));
    w = await publishedWeek(app, { leaveOpen: [['late', '2027-03-05']] });
    seatId = w.seat('late', '2027-03-05');
  });
  afterAll(async () => {
    await db.drop();
  });

  /** Who may take the seat, computed here: each person put in it and the roster scored by scoreRoster. */
  async function expectedEligibility() {
    const { parsed } = await assembleRoster(w.workspace.id, w.roster.id);
    if (!parsed.ok) throw new Error('roster does not parse');
    const row = (await Roster.findByPk(w.roster.id))!;
    const assignment: RosterAssignment = Object.fromEntries(parsed.roster.seats.map((s) => [s.id, null]));
    for (const a of await AssignmentRow.findAll({ where: { runId: row.publishedRunId! } })) assignment[`st${a.seatId}`] = a.personId ? `p${a.personId}` : null;
    const had = new Set(scoreRoster(parsed.roster, assignment).violations.filter((v) => v.hard).map((v) => v.message));
    const out = new Map<number, boolean>();
    for (const p of parsed.roster.people) {
      const after = scoreRoster(parsed.roster, { ...assignment, [`st${seatId}`]: p.id });
      out.set(Number(p.id.slice(1)), after.violations.every((v) => !v.hard || had.has(v.message)));
    }
    return out;
  }

  it('lists the open seat with who can take it, checked person by person as scoreRoster has it', async () => {
    const res = await w.coordinator.get(`/api/rosters/${w.roster.id}/open-seats`);
    expect(res.status).toBe(200);
    expect(res.body.items.map((s: { seatId: number }) => s.seatId)).toEqual([seatId]);
    const expected = await expectedEligibility();
    const item = res.body.items[0];
    expect(item.eligible.map((p: { id: number }) => p.id).sort()).toEqual([...expected].filter(([, ok]) => ok).map(([id]) => id).sort());
    expect(item.ineligible.map((p: { id: number }) => p.id).sort()).toEqual([...expected].filter(([, ok]) => !ok).map(([id]) => id).sort());
    // C works the early on Friday 07–15: a late 15–23 leaves no daily rest (Directive 2003/88/EC Art. 3).
    expect(item.ineligible.map((p: { id: number }) => p.id)).toEqual([w.people.c.id]);
    expect(item.ineligible[0].reason).toMatch(/rest/i);
  });

  it('answers bad offers with a 4xx naming the field, and stores nothing', async () => {
    const draft = await makeApiRoster(w.coordinator, w.workspace, { people: 1 });
    const draftSeat = (await seatsOf(w.workspace.id, draft.roster.id))[0].seatId;
    const cases: Array<[number, Record<string, unknown>, number, string]> = [
      [w.roster.id, { seatId, personIds: [w.people.a.id, w.people.c.id] }, 422, 'body.personIds.1'], // C is not eligible
      [w.roster.id, { seatId: w.seat('late', '2027-03-04') }, 422, 'body.seatId'], // filled
      [w.roster.id, { seatId: draftSeat }, 422, 'body.seatId'], // another roster's seat
      [draft.roster.id, { seatId: draftSeat }, 422, 'params.rosterId'], // unpublished roster
      [w.roster.id, { seatId, personIds: [] }, 400, 'body.personIds'],
      [w.roster.id, { seatId: 'late' }, 400, 'body.seatId'],
    ];
    for (const [rosterId, body, status, field] of cases) {
      const res = await w.coordinator.post(`/api/rosters/${rosterId}/offers`).send(body);
      expect(res.status, JSON.stringify(body)).toBe(status);
      expect(res.body.error.fields.map((f: { path: string }) => f.path), JSON.stringify(body)).toContain(field);
    }
    expect((await w.coordinator.get(`/api/rosters/${w.roster.id}/offers`)).body.items).toEqual([]);
  });

  it('offers the seat; of three eligible takers at once exactly one wins; the coordinator approves and the published roster holds them', async () => {
    const made = await w.coordinator.post(`/api/rosters/${w.roster.id}/offers`).send({ seatId });
    expect(made.status).toBe(201);
    // Everyone scoreRoster lets into the seat (the person the draft roster above added too), C not.
    const expected = [...(await expectedEligibility())].filter(([, ok]) => ok).map(([id]) => id);
    expect(made.body.eligible.map((p: { id: number }) => p.id).sort()).toEqual(expected.sort());
    expect(expected).toEqual(expect.arrayContaining([w.people.a.id, w.people.b.id, w.people.d.id, w.people.e.id]));
    expect(expected).not.toContain(w.people.c.id);
    expect((await w.coordinator.post(`/api/rosters/${w.roster.id}/offers`).send({ seatId })).status).toBe(409);
    // Staff see it when it was offered to them, and not otherwise.
    expect((await w.staff.a.get('/api/me/offers')).body.items.map((o: { id: number }) => o.id)).toEqual([made.body.id]);
    expect((await w.staff.c.get('/api/me/offers')).body.items).toEqual([]);
    expect((await w.staff.c.post(`/api/me/offers/${made.body.id}/take`)).status).toBe(403);

    const takers = [w.staff.a, w.staff.b, w.staff.d];
    const race = await Promise.all(takers.map((t) => t.post(`/api/me/offers/${made.body.id}/take`)));
    expect(race.map((r) => r.status).sort()).toEqual([200, 409, 409]);
    const winner = race.find((r) => r.status === 200)!.body.taker.id as number;
    expect([w.people.a.id, w.people.b.id, w.people.d.id]).toContain(winner);

    const before = mailer.outbox.length;
    const approved = await w.coordinator.post(`/api/offers/${made.body.id}/decision`).send({ decision: 'approve', version: 2 });
    expect(approved.status).toBe(200);
    expect(approved.body.offer.status).toBe('approved');
    const row = (await Roster.findByPk(w.roster.id))!;
    const held = await AssignmentRow.findOne({ where: { runId: row.publishedRunId!, seatId } });
    expect(held?.personId).toBe(winner);
    const winnerEmail = Object.entries(w.emails).find(([key]) => w.people[key as 'a'].id === winner)![1];
    expect(mailer.outbox.slice(before).map((m) => m.to)).toEqual([winnerEmail]);
    expect((await w.coordinator.get(`/api/rosters/${w.roster.id}/open-seats`)).body.items).toEqual([]);
    expect((await w.coordinator.post(`/api/offers/${made.body.id}/decision`).send({ decision: 'approve', version: 3 })).status).toBe(409);
  });

  it('keeps other workspaces out', async () => {
    const other = await makeWorkspace('Elsewhere');
    const them = (await signedIn(app, other, 'coordinator')).agent;
    expect((await them.get(`/api/rosters/${w.roster.id}/open-seats`)).status).toBe(404);
    expect((await them.get(`/api/rosters/${w.roster.id}/offers`)).status).toBe(404);
    const offers = (await w.coordinator.get(`/api/rosters/${w.roster.id}/offers`)).body.items;
    expect((await them.post(`/api/offers/${offers[0].id}/withdraw`).send({ version: offers[0].version })).status).toBe(404);
  });
});
