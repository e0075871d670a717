import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eachDayOfInterval, format, parseISO } from 'date-fns';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import { MAX_SEATS_PER_SHIFT, matchingDays } from '../../../server/rosters/seat-bounds';
import { ROSTER_LIMITS } from '../../../shared/roster/schema';
import { SeatRow } from '../../../server/rosters/models';

/** Issue 13 item 4: seats per roster are bounded in pattern previews and pattern creation. */
describe('pattern seat bounds', () => {
  let db: TestDb;
  let app: ReturnType<typeof makeApp>['app'];
  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
  });
  afterAll(async () => {
    await db.drop();
  });

  it('counts matching days as date-fns does', () => {
    for (const [start, end, weekdays] of [
      ['2027-01-01', '2027-12-31', ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun']],
      ['2028-02-01', '2028-03-31', ['sat', 'sun']],
      ['2027-03-22', '2027-04-04', ['wed']],
    ] as const) {
      // date-fns 'EEE' is the English short weekday name
      const expected = eachDayOfInterval({ start: parseISO(start), end: parseISO(end) }).filter((d) => (weekdays as readonly string[]).includes(format(d, 'EEE').toLowerCase())).length;
      expect(matchingDays(start, end, weekdays)).toBe(expected);
    }
  });

  it('refuses a shift of more than the seat bound and a pattern past the roster\'s seat limit, making nothing', async () => {
    const workspace = await makeWorkspace('Quillbrook Hall');
    const { agent } = await signedIn(app, workspace, 'coordinator');
    const roster = (await agent.post('/api/rosters').send({ name: 'A whole year', periodStart: '2027-01-01', periodEnd: '2027-12-31', timeZone: 'Europe/London' })).body;
    const every = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'];
    const pattern = (label: string, seats: Array<{ skillId: null; count: number }>) => ({ label, weekdays: every, startTime: '07:00', endTime: '15:00', seats });

    // 50 kinds of 100 seats, every day of a year: 1.8 million seats before this bound
    const huge = pattern('huge', Array.from({ length: 50 }, () => ({ skillId: null, count: 100 })));
    for (const step of ['patterns/preview', 'patterns']) {
      const res = await agent.post(`/api/rosters/${roster.id}/${step}`).send(huge);
      expect(res.status, step).toBe(400);
      expect(res.body.error.fields[0].path).toBe('body.seats');
    }

    // 365 days × 100 seats = 36,500 fits; another 365 × 70 = 25,550 would make 62,050 > 60,000
    expect(365 * MAX_SEATS_PER_SHIFT).toBeLessThan(ROSTER_LIMITS.seats);
    const first = await agent.post(`/api/rosters/${roster.id}/patterns`).send(pattern('day', [{ skillId: null, count: MAX_SEATS_PER_SHIFT }]));
    expect(first.status).toBe(201);
    expect(first.body.shiftsCreated).toBe(365);
    const second = pattern('late', [{ skillId: null, count: 70 }]);
    for (const step of ['patterns/preview', 'patterns']) {
      const res = await agent.post(`/api/rosters/${roster.id}/${step}`).send(second);
      expect(res.status, step).toBe(422);
      expect(res.body.error.fields[0].path).toBe('body.seats');
      expect(res.body.error.message).toContain(String(ROSTER_LIMITS.seats));
    }
    expect(await SeatRow.count({ where: { workspaceId: workspace.id } })).toBe(36_500);
  }, 120_000);
});
