import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { agent, makeApp, makePerson, makeWorkspace, signedIn } from '../auth/helpers';
import type { Workspace } from '../../../server/db/models';
import { AssignmentRow, Roster, SeatRow, ShiftRow, WishRow } from '../../../server/rosters/models';
import { OfferRow, SwapRow } from '../../../server/swaps/models';
import { makeApiRoster } from '../rosters/fixtures';
import { publishDirectly, seatsOf } from '../staff/publish-helper';
import { directCounts, publicHolidays, type Direct } from './direct-count';

type Agent = ReturnType<typeof agent>;

/** Every value of a key anywhere in a JSON answer. */
function valuesOf(body: unknown, key: string): unknown[] {
  if (Array.isArray(body)) return body.flatMap((x) => valuesOf(x, key));
  if (body && typeof body === 'object') return Object.entries(body).flatMap(([k, v]) => [...(k === key ? [v] : []), ...valuesOf(v, key)]);
  return [];
}

const sumOf = (rows: Direct[]) => rows.reduce((acc, c) => Object.fromEntries(Object.keys(acc).map((k) => [k, acc[k as keyof Direct] + c[k as keyof Direct]])) as Direct);

/**
 * GET /api/me/ledger: a staff member's own counts beside the team's per-person average. Checked
 * against counts made here from the stored rows (direct-count.ts), and for privacy: no other
 * person's id or name anywhere in the answer, no period average with fewer than two colleagues in
 * it (the team's sum less one's own would be that colleague's counts), and ranges that pick whole
 * periods only (so two answers never differ by a few days of one person's work).
 */
describe('a staff member’s own ledger', () => {
  let db: TestDb;
  let app: Express;
  let workspace: Workspace;
  let coordinator: Agent;
  let people: Array<{ id: number; name: string }>;
  let fortnight: number;
  let week: number;
  let me: Agent;
  let direct: Map<number, Map<number, Direct>>;

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    workspace = await makeWorkspace('Willowmere House');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    const all = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'];
    // A fortnight across Easter 2027 (Good Friday 26, Easter Monday 29 March in England) with four people.
    const fixture = await makeApiRoster(coordinator, workspace, {
      people: 4,
      periodStart: '2027-03-22',
      periodEnd: '2027-04-04',
      patterns: [
        { label: 'early', weekdays: all, startTime: '07:00', endTime: '15:00', seats: [{ skillId: null, count: 1 }] },
        { label: 'night', weekdays: all, startTime: '21:00', endTime: '07:00', seats: [{ skillId: null, count: 1 }] },
      ],
    });
    people = fixture.people;
    fortnight = fixture.roster.id;
    const [a, b, c, d] = people;
    const seats = await seatsOf(workspace.id, fortnight);
    const nth = (s: (typeof seats)[number]) => seats.filter((x) => x.label === s.label).indexOf(s);
    // Earlies: A on even days, B on odd ones; nights: C the first ten, then A two, D two.
    const first = await publishDirectly(
      workspace.id,
      fortnight,
      seats.map((s) => ({ seatId: s.seatId, personId: s.label === 'early' ? (nth(s) % 2 === 0 ? a.id : b.id) : nth(s) < 10 ? c.id : nth(s) < 12 ? a.id : d.id })),
    );
    await Roster.update({ status: 'draft' }, { where: { id: fortnight } });
    for (const [p, date, kind] of [[a, '2027-03-22', 'prefer'], [a, '2027-03-23', 'avoid'], [b, '2027-03-23', 'prefer'], [c, '2027-03-26', 'cannot'], [d, '2027-03-26', 'avoid'], [a, '2027-04-02', 'avoid']] as const) {
      expect((await coordinator.post(`/api/rosters/${fortnight}/wishes`).send({ personId: p.id, date, kind })).status).toBe(201);
    }
    await Roster.update({ status: 'published' }, { where: { id: fortnight } });
    // An approved swap of A and B and an approved offer A took count; a refused swap does not.
    const check = { ok: true, breaches: [], scoreBefore: 0, scoreAfter: 0, termChanges: [], words: [] };
    await SwapRow.create({ workspaceId: workspace.id, rosterId: fortnight, kind: 'swap', proposerPersonId: a.id, proposerSeatId: seats[0].seatId, colleaguePersonId: b.id, colleagueSeatId: seats[2].seatId, status: 'approved', checkResult: check as never, baseRunId: first.runId });
    await SwapRow.create({ workspaceId: workspace.id, rosterId: fortnight, kind: 'giveaway', proposerPersonId: c.id, proposerSeatId: seats[1].seatId, colleaguePersonId: d.id, status: 'refused', checkResult: check as never });
    await OfferRow.create({ workspaceId: workspace.id, rosterId: fortnight, seatId: seats[3].seatId, status: 'approved', eligible: [a.id, d.id], takerPersonId: a.id, takenAt: new Date() });

    // The week after, worked by A and B only: its team average would be B's own counts.
    const next = await coordinator.post('/api/rosters').send({ name: 'A and B week', periodStart: '2027-04-05', periodEnd: '2027-04-11', timeZone: 'Europe/London' });
    week = next.body.id;
    expect((await coordinator.post(`/api/rosters/${week}/patterns`).send({ label: 'early', weekdays: all, startTime: '07:00', endTime: '15:00', seats: [{ skillId: null, count: 1 }] })).status).toBe(201);
    const weekSeats = await seatsOf(workspace.id, week);
    await publishDirectly(workspace.id, week, weekSeats.map((s, i) => ({ seatId: s.seatId, personId: i % 2 === 0 ? a.id : b.id })));

    expect((await coordinator.put('/api/ledger/settings').send({ region: 'GB-ENG', nightWeight: 3, weekendWeight: 3, lookbackDays: 91, version: 1 })).status).toBe(200);
    me = (await signedIn(app, workspace, 'staff', { personId: a.id })).agent;

    const holidays = new Set(publicHolidays('GB', 'ENG', 2027));
    direct = new Map();
    for (const rosterId of [fortnight, week]) {
      const roster = (await Roster.findByPk(rosterId))!;
      const rows = await AssignmentRow.findAll({ where: { runId: roster.publishedRunId! } });
      const seatRows = await SeatRow.findAll({ where: { id: rows.map((r) => r.seatId) } });
      const swaps = await SwapRow.findAll({ where: { rosterId, status: 'approved' } });
      const offers = await OfferRow.findAll({ where: { rosterId, status: 'approved' } });
      direct.set(
        rosterId,
        directCounts({
          start: roster.periodStart,
          end: roster.periodEnd,
          timeZone: roster.timeZone,
          shifts: (await ShiftRow.findAll({ where: { rosterId } })).map((s) => ({ id: s.id, startsLocal: s.startsLocal, endsLocal: s.endsLocal })),
          rows: rows.map((r) => ({ personId: r.personId, shiftId: seatRows.find((x) => x.id === r.seatId)!.shiftId })),
          wishes: (await WishRow.findAll({ where: { rosterId } })).map((w) => ({ personId: w.personId, date: w.date ?? null, shiftId: w.shiftId ?? null, kind: w.kind })),
          holidays,
          contractWeekly: new Map(people.map((p) => [p.id, 30])),
          swapPeople: [...swaps.flatMap((s) => [s.proposerPersonId, s.colleaguePersonId]), ...offers.map((o) => o.takerPersonId!)],
        }),
      );
    }
  });
  afterAll(async () => {
    await db.drop();
  });

  it('gives my counts per period and in total, as the stored assignments have them', async () => {
    const res = await me.get('/api/me/ledger');
    expect(res.status).toBe(200);
    const a = people[0];
    const mineIn = (rosterId: number) => direct.get(rosterId)!.get(a.id)!;
    // The fixture has something of every kind for A, so a line of zeros cannot pass.
    for (const k of ['nights', 'weekendShifts', 'weekendsWorked', 'holidayShifts', 'unpopularShifts', 'wishesHonoured', 'wishesRefused', 'swaps'] as const) expect(mineIn(fortnight)[k], k).toBeGreaterThan(0);
    expect(res.body.periods.map((p: { rosterId: number }) => p.rosterId)).toEqual([fortnight, week]);
    expect(res.body.me.personId).toBe(a.id);
    for (const rosterId of [fortnight, week]) {
      const got = res.body.me.byPeriod.find((b: { rosterId: number }) => b.rosterId === rosterId);
      for (const [k, v] of Object.entries(mineIn(rosterId))) expect(got[k], `${k} in roster ${rosterId}`).toBeCloseTo(v, 2);
    }
    for (const [k, v] of Object.entries(sumOf([mineIn(fortnight), mineIn(week)]))) expect(res.body.me.totals[k], k).toBeCloseTo(v, 2);
    // The coordinator's ledger over the same whole periods has the same line.
    const coordinators = (await coordinator.get('/api/ledger')).body;
    expect(res.body.me.totals).toEqual(coordinators.people.find((p: { personId: number }) => p.personId === a.id).totals);
    // The team's periods keep their roster ids (summing counts once turned them into NaN, null in JSON).
    expect(coordinators.team.byPeriod.map((t: { rosterId: number }) => t.rosterId)).toEqual([fortnight, week]);
  });

  it('sets the team’s per-person average beside mine, only where at least two colleagues are counted', async () => {
    const res = await me.get('/api/me/ledger');
    const team = res.body.team;
    const fortnightPeople = [...direct.get(fortnight)!.values()];
    expect(team.byPeriod.map((t: { rosterId: number; people: number }) => [t.rosterId, t.people])).toEqual([[fortnight, 4], [week, 2]]);
    const average = team.byPeriod[0].average;
    for (const [k, v] of Object.entries(sumOf(fortnightPeople))) expect(average[k], k).toBeCloseTo(v / 4, 2);
    // The week: A and B only. Its average less A's own would be B's line, so it is withheld.
    expect(team.byPeriod[1].average).toBeNull();
    expect(team.rosterIds).toEqual([fortnight]);
    expect(team.average).toEqual(average);
    for (const [k, v] of Object.entries(direct.get(fortnight)!.get(people[0].id)!)) expect(team.mine[k], k).toBeCloseTo(v, 2);
    expect(res.body.teamSize).toBe(4);
    expect(res.body.minColleagues).toBe(2);
  });

  it('names no one else: no other id, name or per-person line anywhere in the answer', async () => {
    const res = await me.get('/api/me/ledger');
    const text = JSON.stringify(res.body);
    for (const other of people.slice(1)) expect(text).not.toContain(other.name);
    expect(valuesOf(res.body, 'personId')).toEqual([people[0].id]);
    expect(valuesOf(res.body, 'people').every((v) => typeof v === 'number')).toBe(true);
    expect(valuesOf(res.body, 'name').sort()).toEqual([people[0].name, ...res.body.periods.map((p: { name: string }) => p.name), ...res.body.holidays.map((h: { name: string }) => h.name)].sort());
    expect(valuesOf(res.body, 'id')).toEqual([]);
    // Staff never get the coordinators' ledger with its per-person lines.
    expect((await me.get('/api/ledger')).status).toBe(403);
  });

  it('picks whole periods by range, so a range of one day cannot isolate a day of someone’s work', async () => {
    const day = await me.get('/api/me/ledger').query({ from: '2027-03-29', to: '2027-03-29' });
    expect(day.status).toBe(200);
    expect(day.body.periods.map((p: { rosterId: number }) => p.rosterId)).toEqual([fortnight]);
    expect(day.body.from).toBe('2027-03-22');
    expect(day.body.to).toBe('2027-04-04');
    const whole = (await me.get('/api/me/ledger')).body;
    const { rosterId: _, ...wholeFortnight } = whole.me.byPeriod[0];
    expect(day.body.me.totals).toEqual(wholeFortnight);
    expect(day.body.team.byPeriod[0]).toEqual(whole.team.byPeriod[0]);
    // The coordinator's ledger does clip to the day: one early, one night (Easter Monday).
    const clipped = (await coordinator.get('/api/ledger').query({ from: '2027-03-29', to: '2027-03-29' })).body;
    expect(clipped.team.totals.shifts).toBe(2);
    expect(day.body.team.byPeriod[0].average.shifts * 4).toBeCloseTo(28, 6);
    // Only the A-and-B week: nothing of the team's to show.
    const weekOnly = (await me.get('/api/me/ledger').query({ from: '2027-04-06' })).body;
    expect(weekOnly.team).toMatchObject({ rosterIds: [], byPeriod: [{ rosterId: week, people: 2, average: null }] });
    expect(Object.values(weekOnly.team.average)).toEqual(Array(11).fill(0));
  });

  it('answers bad input and an unlinked account with a 4xx naming the field', async () => {
    const bad = await me.get('/api/me/ledger').query({ from: '2027-04-04', to: '2027-03-22' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields[0].path).toBe('query.to');
    expect((await me.get('/api/me/ledger').query({ from: '2027-02-30' })).body.error.fields[0].path).toBe('query.from');
    const unlinked = (await signedIn(app, workspace, 'staff')).agent;
    const res = await unlinked.get('/api/me/ledger');
    expect(res.status).toBe(409);
    expect(res.body.error.fields[0].path).toBe('auth.personId');
  });

  it('is empty, not an error, before anything is published', async () => {
    const other = await makeWorkspace('Another house');
    const coord = (await signedIn(app, other, 'coordinator')).agent;
    const person = await makePerson(other, { name: 'Quill Ashby' });
    const staff = (await signedIn(app, other, 'staff', { personId: person.id })).agent;
    const empty = await staff.get('/api/me/ledger');
    expect(empty.status).toBe(200);
    expect(empty.body).toMatchObject({ from: null, to: null, periods: [], me: null, teamSize: 0, team: { byPeriod: [], rosterIds: [] } });
    expect((await coord.get('/api/ledger')).body.people).toEqual([]);
    // Another workspace's ledger never reaches this one.
    const mine = await me.get('/api/me/ledger');
    expect(mine.body.periods).toHaveLength(2);
  });
});
