import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import { makeApiRoster } from '../rosters/fixtures';
import { publishDirectly, seatsOf } from './publish-helper';
import { readCalendar, readEvents } from '../helpers/ical-read';

/**
 * Hand-computed instants for a period across the end of British Summer Time in 2027. Source: the
 * UK rule (Summer Time Order 2002, the same as EU Directive 2000/84/EC Art. 2): clocks go back at
 * 01:00 UTC on the last Sunday of October. 31 October 2027 is a Sunday: before 01:00 UTC London
 * is UTC+1 (BST), from then UTC+0 (GMT), so the wall clock shows 01:00–01:59 twice.
 */
const EXPECTED = {
  'early 2027-10-29': ['2027-10-29T06:00:00.000Z', '2027-10-29T14:00:00.000Z'], // Fri, BST: 07:00 local = 06:00 UTC
  'night 2027-10-30': ['2027-10-30T20:00:00.000Z', '2027-10-31T07:00:00.000Z'], // 21:00 BST → 07:00 GMT: 11 h, not 10
  'early 2027-11-01': ['2027-11-01T07:00:00.000Z', '2027-11-01T15:00:00.000Z'], // Mon, GMT
  // 17:30 BST → 01:30 on the night the hour repeats; Rotaloom reads a repeated time at its second,
  // GMT occurrence (shared/roster/time.ts), so 16:30 → 01:30 UTC, 9 h
  'late 2027-10-30': ['2027-10-30T16:30:00.000Z', '2027-10-31T01:30:00.000Z'],
} as const;

describe('calendar feed across the autumn daylight-saving change (ambiguous local times)', () => {
  let db: TestDb;
  let app: Express;

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
  });
  afterAll(async () => {
    await db.drop();
  });

  it('writes each shift at its real instant: TZID local times where the clock is unambiguous, UTC where it repeats; hours are elapsed hours', async () => {
    const workspace = await makeWorkspace('Fenwick Night Care');
    const coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    const fixture = await makeApiRoster(coordinator, workspace, {
      periodStart: '2027-10-25',
      periodEnd: '2027-11-07',
      patterns: [
        { label: 'early', weekdays: ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'], startTime: '07:00', endTime: '15:00', seats: [{ skillId: null, count: 1 }] },
        { label: 'night', weekdays: ['sat'], startTime: '21:00', endTime: '07:00', seats: [{ skillId: null, count: 1 }] },
        { label: 'late', weekdays: ['sat'], startTime: '17:30', endTime: '01:30', seats: [{ skillId: null, count: 1 }] },
      ],
    });
    const [me, colleague] = fixture.people;
    const feedOf = async (personId: number) => {
      const a = (await signedIn(app, workspace, 'staff', { personId })).agent;
      const made = await a.post('/api/me/feed');
      expect(made.status).toBe(201);
      return { agent: a, path: new URL(made.body.url).pathname };
    };
    const mine = await feedOf(me.id);
    const theirs = await feedOf(colleague.id);

    const seats = await seatsOf(workspace.id, fixture.roster.id);
    const seat = (label: string, day: string) => seats.find((s) => s.label === label && s.startsLocal.startsWith(day))!.seatId;
    await publishDirectly(workspace.id, fixture.roster.id, [
      { seatId: seat('early', '2027-10-29'), personId: me.id },
      { seatId: seat('night', '2027-10-30'), personId: me.id },
      { seatId: seat('early', '2027-11-01'), personId: me.id },
      { seatId: seat('late', '2027-10-30'), personId: colleague.id },
    ]);

    const text = (await request(app).get(mine.path)).text;
    expect(readCalendar(text).name).toBe('vcalendar');
    // ical.js (an independent RFC 5545 reader) turns the TZID times into instants from the VTIMEZONE the file carries (§3.6.5).
    expect(text).toContain('BEGIN:VTIMEZONE\r\nTZID:Europe/London\r\n');
    const events = readEvents(text);
    expect(Object.fromEntries(events.map((e) => [`${e.summary.split(' ')[0]} ${e.start.slice(0, 10)}`, [e.start, e.end]]))).toEqual({
      'early 2027-10-29': EXPECTED['early 2027-10-29'],
      'night 2027-10-30': EXPECTED['night 2027-10-30'],
      'early 2027-11-01': EXPECTED['early 2027-11-01'],
    });
    expect(events.map((e) => e.startZone)).toEqual(['Europe/London', 'Europe/London', 'Europe/London']);
    // RFC 5545 §3.3.5: DTSTART;TZID=Europe/London:20271030T210000 and DTEND at 07:00 the next morning.
    expect(text).toContain('DTSTART;TZID=Europe/London:20271030T210000');
    expect(text).toContain('DTEND;TZID=Europe/London:20271031T070000');

    // A time in the repeated hour names one instant only in UTC (RFC 5545 §3.3.5 form #2); readers differ on TZID there.
    const late = readEvents((await request(app).get(theirs.path)).text);
    expect(late.map((e) => [e.start, e.end, e.startZone])).toEqual([[...EXPECTED['late 2027-10-30'], null]]);

    // My shifts say the same in elapsed hours: the night is 11 h; the week Mon 25 – Sun 31 Oct holds the early (8 h) and the night.
    const week = (await mine.agent.get('/api/me/shifts').query({ week: '2027-10-30' })).body;
    const night = week.shifts.find((s: { label: string }) => s.label === 'night');
    expect(night).toMatchObject({ startsLocal: '2027-10-30T21:00', endsLocal: '2027-10-31T07:00', startsAt: EXPECTED['night 2027-10-30'][0], endsAt: EXPECTED['night 2027-10-30'][1], hours: 11 });
    expect(week.week).toMatchObject({ start: '2027-10-25', end: '2027-10-31', hours: 19, shifts: 2 });
    const theirWeek = (await theirs.agent.get('/api/me/shifts').query({ week: '2027-10-30' })).body;
    expect(theirWeek.shifts.find((s: { label: string }) => s.label === 'late')).toMatchObject({ startsAt: EXPECTED['late 2027-10-30'][0], endsAt: EXPECTED['late 2027-10-30'][1], hours: 9 });
  });
});
