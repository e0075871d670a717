import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { format, isSunday, isWeekend, parseISO, subDays } from 'date-fns';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import { AssignmentRow, Roster, SeatRow, ShiftRow, WishRow } from '../../../server/rosters/models';
import { assembleRoster } from '../../../server/rosters/assemble';
import { scoreRoster } from '../../../solver/roster';
import type { Workspace } from '../../../server/db/models';
import { makeApiRoster } from '../rosters/fixtures';
import { publishDirectly, seatsOf } from '../staff/publish-helper';
import { isNightSpan, publicHolidays, zoneHours } from './direct-count';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

/**
 * Elapsed hours of a local span in London. The counts below are made apart from server/ledger with
 * direct-count.ts's pieces (hours, Directive 2003/88/EC night work, public holidays); not with its
 * directCounts, which counts whole periods only and this test counts a range too.
 */
const londonHours = (a: string, b: string) => zoneHours(a, b, 'Europe/London');

describe('fairness ledger across published rosters', () => {
  let db: TestDb;
  let app: Express;
  let workspace: Workspace;
  let coordinator: Agent;
  let people: Array<{ id: number; name: string }>;
  let rosterId: number;

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    workspace = await makeWorkspace('Willowmere House');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    // Two weeks across Easter 2027 and the start of British Summer Time (Sunday 28 March).
    const fixture = await makeApiRoster(coordinator, workspace, {
      people: 4,
      periodStart: '2027-03-22',
      periodEnd: '2027-04-04',
      patterns: [
        { label: 'early', weekdays: ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'], startTime: '07:00', endTime: '15:00', seats: [{ skillId: null, count: 1 }] },
        { label: 'night', weekdays: ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'], startTime: '21:00', endTime: '07:00', seats: [{ skillId: null, count: 1 }] },
      ],
    });
    people = fixture.people;
    rosterId = fixture.roster.id;
    const [a, b, c, d] = people;
    const seats = await seatsOf(workspace.id, rosterId);
    // Earlies alternate A and B; C works the first ten nights, D the last four.
    await publishDirectly(
      workspace.id,
      rosterId,
      seats.map((s) => {
        const day = seats.filter((x) => x.label === s.label).indexOf(s);
        return { seatId: s.seatId, personId: s.label === 'early' ? (day % 2 === 0 ? a.id : b.id) : day < 10 ? c.id : d.id };
      }),
    );
    const wish = (personId: number, date: string, kind: string) => coordinator.post(`/api/rosters/${rosterId}/wishes`).send({ personId, date, kind });
    await Roster.update({ status: 'draft' }, { where: { id: rosterId } }); // wishes are entered while the roster is open
    for (const [p, date, kind] of [[a, '2027-03-22', 'prefer'], [a, '2027-03-23', 'avoid'], [b, '2027-03-23', 'prefer'], [c, '2027-03-26', 'cannot'], [d, '2027-03-26', 'avoid'], [d, '2027-04-03', 'prefer']] as const) {
      expect((await wish(p.id, date, kind)).status).toBe(201);
    }
    await Roster.update({ status: 'published' }, { where: { id: rosterId } });
  });
  afterAll(async () => {
    await db.drop();
  });

  it('keeps a holiday calendar: entered days and a date-holidays region; bad settings are a 4xx naming the field', async () => {
    const first = await coordinator.get('/api/ledger/settings');
    expect(first.body).toMatchObject({ region: null, nightWeight: 3, weekendWeight: 3, lookbackDays: 91, version: 1 });
    for (const [body, status, field] of [
      [{ region: 'ZZ', nightWeight: 3, weekendWeight: 3, lookbackDays: 91, version: 1 }, 422, 'body.region'],
      [{ region: 'GB-XYZ', nightWeight: 3, weekendWeight: 3, lookbackDays: 91, version: 1 }, 422, 'body.region'],
      [{ region: 'england', nightWeight: 3, weekendWeight: 3, lookbackDays: 91, version: 1 }, 400, 'body.region'],
      [{ region: null, nightWeight: -1, weekendWeight: 3, lookbackDays: 91, version: 1 }, 400, 'body.nightWeight'],
      [{ region: null, nightWeight: 3, weekendWeight: 3, lookbackDays: 3, version: 1 }, 400, 'body.lookbackDays'],
      [{ region: null, nightWeight: 3, weekendWeight: 3, lookbackDays: 91, version: 7 }, 409, 'body.version'],
    ] as const) {
      const res = await coordinator.put('/api/ledger/settings').send(body);
      expect(res.status, JSON.stringify(body)).toBe(status);
      expect(res.body.error.fields.map((f: { path: string }) => f.path)).toContain(field);
    }
    const saved = await coordinator.put('/api/ledger/settings').send({ region: 'GB-ENG', nightWeight: 4, weekendWeight: 2, lookbackDays: 91, version: 1 });
    expect(saved.status).toBe(200);
    expect((await coordinator.put('/api/ledger/settings').send({ region: 'GB-ENG', nightWeight: 4, weekendWeight: 2, lookbackDays: 91, version: 1 })).status).toBe(409);
    expect((await coordinator.post('/api/ledger/holidays').send({ date: '2027-03-24', name: 'Founders’ day' })).status).toBe(201);
    const dup = await coordinator.post('/api/ledger/holidays').send({ date: '2027-03-24', name: 'Again' });
    expect(dup.status).toBe(409);
    expect(dup.body.error.fields[0].path).toBe('body.date');
    expect((await coordinator.post('/api/ledger/holidays').send({ date: '2027-02-30', name: 'Nope' })).body.error.fields[0].path).toBe('body.date');
    const now = (await coordinator.get('/api/ledger/settings')).body;
    // Good Friday and Easter Monday 2027 in England, as date-holidays has them.
    const dh = publicHolidays('GB', 'ENG', 2027);
    expect(dh).toEqual(expect.arrayContaining(['2027-03-26', '2027-03-29']));
    expect(now.holidays.filter((h: { date: string }) => h.date >= '2027-03-22' && h.date <= '2027-04-04').map((h: { date: string; source: string }) => `${h.date} ${h.source}`)).toEqual(['2027-03-24 entered', '2027-03-26 region', '2027-03-29 region']);
  });

  it('counts per person what the stored assignments say, over the whole period and a range', async () => {
    const holidays = new Set([...publicHolidays('GB', 'ENG', 2027), '2027-03-24']);
    const roster = (await Roster.findByPk(rosterId))!;
    const rows = await AssignmentRow.findAll({ where: { runId: roster.publishedRunId! } });
    const seats = await SeatRow.findAll({ where: { id: rows.map((r) => r.seatId) } });
    const shifts = await ShiftRow.findAll({ where: { rosterId } });
    const wishes = await WishRow.findAll({ where: { rosterId } });
    const expected = (from: string, to: string) => {
      const out = new Map<number, Record<string, number>>();
      const weekends = new Map<number, Set<string>>();
      const inRange = shifts.filter((s) => s.startsLocal.slice(0, 10) >= from && s.startsLocal.slice(0, 10) <= to);
      const against = (s: ShiftRow) => wishes.filter((w) => w.date === s.startsLocal.slice(0, 10)).reduce((n, w) => n + (w.kind === 'prefer' ? -1 : 1), 0);
      for (const r of rows) {
        const shift = inRange.find((s) => s.id === seats.find((x) => x.id === r.seatId)!.shiftId);
        if (!shift || !r.personId) continue;
        const c = out.get(r.personId) ?? { shifts: 0, hours: 0, nights: 0, weekendShifts: 0, weekendsWorked: 0, holidayShifts: 0, unpopularShifts: 0, wishesHonoured: 0, wishesRefused: 0 };
        c.shifts++;
        c.hours += londonHours(shift.startsLocal, shift.endsLocal);
        if (isNightSpan(shift.startsLocal, shift.endsLocal)) c.nights++;
        const date = parseISO(shift.startsLocal.slice(0, 10));
        if (isWeekend(date)) {
          c.weekendShifts++;
          // a weekend is known by its Saturday (date-fns)
          const set = weekends.get(r.personId) ?? weekends.set(r.personId, new Set()).get(r.personId)!;
          set.add(format(isSunday(date) ? subDays(date, 1) : date, 'yyyy-MM-dd'));
          c.weekendsWorked = set.size;
        }
        if (holidays.has(shift.startsLocal.slice(0, 10))) c.holidayShifts++;
        if (against(shift) > 0) c.unpopularShifts++;
        out.set(r.personId, c);
      }
      for (const w of wishes) {
        const day = inRange.filter((s) => s.startsLocal.slice(0, 10) === w.date);
        if (!day.length) continue;
        const works = rows.some((r) => r.personId === w.personId && day.some((s) => s.id === seats.find((x) => x.id === r.seatId)!.shiftId));
        const c = out.get(w.personId)!;
        c[(w.kind === 'prefer') === works ? 'wishesHonoured' : 'wishesRefused']++;
      }
      return out;
    };
    for (const [from, to] of [['2027-03-22', '2027-04-04'], ['2027-03-29', '2027-04-04']]) {
      const res = await coordinator.get('/api/ledger').query({ from, to });
      expect(res.status).toBe(200);
      const want = expected(from, to);
      const sum = (k: string) => [...want.values()].reduce((n, c) => n + c[k], 0);
      // The fixture has something of every kind to count, so a ledger of zeros cannot pass.
      if (from === '2027-03-22') for (const k of ['nights', 'weekendShifts', 'weekendsWorked', 'holidayShifts', 'unpopularShifts', 'wishesHonoured', 'wishesRefused']) expect(sum(k), k).toBeGreaterThan(0);
      expect(res.body.people.map((p: { personId: number }) => p.personId).sort()).toEqual([...want.keys()].sort());
      for (const p of res.body.people) {
        const w = want.get(p.personId)!;
        for (const k of Object.keys(w)) expect(p.totals[k], `${p.name} ${k} ${from}`).toBeCloseTo(w[k], 6);
        // 30 h a week over the days of the range.
        const days = (Date.parse(to) - Date.parse(from)) / 86_400_000 + 1;
        expect(p.totals.contractHours).toBeCloseTo((30 * days) / 7, 2);
      }
      const teamShifts = [...want.values()].reduce((n, c) => n + c.shifts, 0);
      expect(res.body.team.totals.shifts).toBe(teamShifts);
    }
    // The night from Saturday 27 to Sunday 28 March is 9 h: clocks go forward at 01:00 UTC that night.
    expect(londonHours('2027-03-27T21:00', '2027-03-28T07:00')).toBe(9);
    const bad = await coordinator.get('/api/ledger').query({ from: '2027-04-04', to: '2027-03-22' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields[0].path).toBe('query.to');
    expect((await coordinator.get('/api/ledger').query({ from: '2027-13-01' })).body.error.fields[0].path).toBe('query.from');
  });

  it('feeds the next roster: who worked more nights than their share gets a soft "at most" nights term with the ledger weight', async () => {
    const [, , c, d] = people;
    const next = await coordinator.post('/api/rosters').send({ name: 'Next fortnight', periodStart: '2027-04-05', periodEnd: '2027-04-11', timeZone: 'Europe/London' });
    expect(next.status).toBe(201);
    const all = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'];
    expect((await coordinator.post(`/api/rosters/${next.body.id}/patterns`).send({ label: 'night', weekdays: all, startTime: '21:00', endTime: '07:00', seats: [{ skillId: null, count: 1 }] })).status).toBe(201);
    const { parsed, input } = await assembleRoster(workspace.id, next.body.id);
    expect(parsed.ok).toBe(true);
    if (!parsed.ok) return;
    // Earlier fortnight: 14 nights shared by four people on equal contracts, 3.5 each; C worked 10 (6 over), D 4 (0 over).
    // This week: 7 nights, 1.75 each, rounded up to 2 (derive.ts fairShares); C may take max(0, 2 − 6) = 0 without cost.
    const terms = (id: number) => input.people.find((p) => p.id === `p${id}`)!.terms ?? [];
    expect(terms(c.id)).toEqual([{ kind: 'maxNights', count: 0, hard: false, weight: 4 }]);
    expect(terms(d.id)).toEqual([]);
    const seats = parsed.roster.seats;
    const withC = Object.fromEntries(seats.map((s, i) => [s.id, i === 0 ? `p${c.id}` : `p${d.id}`]));
    const withoutC = Object.fromEntries(seats.map((s, i) => [s.id, i === 0 ? `p${people[0].id}` : `p${d.id}`]));
    const cost = (a: Record<string, string>) => scoreRoster(parsed.roster, a).violations.filter((v) => v.term === 'maxNights');
    expect(cost(withC).map((v) => v.points)).toEqual([-4]);
    expect(cost(withoutC)).toEqual([]);
  });
});
