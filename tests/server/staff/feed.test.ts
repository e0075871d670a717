import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { agent, makeApp, makeUser, makeWorkspace, PASSWORD, signedIn } from '../auth/helpers';
import { Person, type Workspace } from '../../../server/db/models';
import { makeApiRoster } from '../rosters/fixtures';
import { publishDirectly, seatsOf } from './publish-helper';
import { readCalendar, readEvents, type ReadEvent } from '../helpers/ical-read';

type Agent = ReturnType<typeof agent>;

/**
 * Hand-computed instants for a period across the start of British Summer Time in 2027. Source: the
 * UK rule (Summer Time Order 2002, the same as EU Directive 2000/84/EC Art. 2): clocks go forward
 * at 01:00 UTC on the last Sunday of March. 31 March 2027 is a Wednesday, so that Sunday is
 * 28 March 2027: before it London is UTC+0 (GMT), from 01:00 UTC on it UTC+1 (BST).
 */
const EXPECTED = {
  'early 2027-03-26': ['2027-03-26T07:00:00.000Z', '2027-03-26T15:00:00.000Z'], // Fri, GMT: 07:00 local = 07:00 UTC
  'early 2027-03-27': ['2027-03-27T07:00:00.000Z', '2027-03-27T15:00:00.000Z'], // Sat, GMT
  'night 2027-03-27': ['2027-03-27T21:00:00.000Z', '2027-03-28T06:00:00.000Z'], // 21:00 GMT → 07:00 BST: 9 h, not 10
  'early 2027-03-28': ['2027-03-28T06:00:00.000Z', '2027-03-28T14:00:00.000Z'], // Sun, already BST: 07:00 local = 06:00 UTC
  'early 2027-03-29': ['2027-03-29T06:00:00.000Z', '2027-03-29T14:00:00.000Z'], // Mon, BST
  'early 2027-03-30': ['2027-03-30T06:00:00.000Z', '2027-03-30T14:00:00.000Z'], // Tue, BST
} as const;

type Parsed = ReadEvent;

/** The feed as ical.js (an independent RFC 5545 parser from npm) reads it, with the VTIMEZONE the feed carries. */
function parse(text: string): Parsed[] {
  expect(readCalendar(text).name).toBe('vcalendar');
  return readEvents(text);
}

describe('calendar feed: private iCalendar subscription across a daylight-saving change', () => {
  let db: TestDb;
  let app: Express;
  let workspace: Workspace;
  let coordinator: Agent;
  let staff: Agent;
  let me: { id: number; name: string };
  let colleague: { id: number; name: string };
  let rosterId: number;
  let seats: Awaited<ReturnType<typeof seatsOf>>;
  let feedPath: string;
  let first: Parsed[];

  const seat = (label: string, day: string, position = 0) => seats.find((s) => s.label === label && s.startsLocal.startsWith(day) && s.position === position)!.seatId;
  const pathOf = (url: string) => new URL(url).pathname;

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    workspace = await makeWorkspace('Saltmarsh Respite House');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    const fixture = await makeApiRoster(coordinator, workspace, {
      periodStart: '2027-03-22',
      periodEnd: '2027-04-04',
      patterns: [
        { label: 'early', weekdays: ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'], startTime: '07:00', endTime: '15:00', seats: [{ skillId: null, count: 2 }] },
        { label: 'night', weekdays: ['sat'], startTime: '21:00', endTime: '07:00', seats: [{ skillId: null, count: 1 }] },
      ],
    });
    rosterId = fixture.roster.id;
    [me, colleague] = fixture.people;
    // A long name makes the description longer than one 75-octet line, so folding is exercised.
    await Person.update({ name: 'Rosalind Featherstonehaugh-Quillfeather of the Garden Wing' }, { where: { id: colleague.id } });
    colleague.name = 'Rosalind Featherstonehaugh-Quillfeather of the Garden Wing';
    const user = await makeUser({ workspace, role: 'staff' });
    await Person.update({ userId: user.id }, { where: { id: me.id } });
    staff = agent(app);
    expect((await staff.post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD })).status).toBe(200);
    seats = await seatsOf(workspace.id, rosterId);
  });
  afterAll(async () => {
    await db.drop();
  });

  it('makes a private address whose token is not stored, shown once', async () => {
    expect((await staff.get('/api/me/feed')).body).toEqual({ active: false, createdAt: null });
    const made = await staff.post('/api/me/feed');
    expect(made.status).toBe(201);
    expect(made.body.url).toMatch(/^http:\/\/.+\/api\/feeds\/[A-Za-z0-9_-]{43}\.ics$/);
    feedPath = pathOf(made.body.url);
    const token = feedPath.slice('/api/feeds/'.length, -'.ics'.length);
    const [rows] = await db.sequelize.query('SELECT * FROM calendar_feeds');
    expect(rows).toHaveLength(1);
    expect(JSON.stringify(rows)).not.toContain(token);
    const status = await staff.get('/api/me/feed');
    expect(status.body.active).toBe(true);
    expect(status.body).not.toHaveProperty('url');
  });

  it('serves an empty calendar before anything is published, to anyone holding the address (no session)', async () => {
    const res = await request(app).get(feedPath);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/calendar; charset=utf-8/);
    expect(parse(res.text)).toEqual([]);
  });

  it('has one event per published shift, at the right UTC instant on both sides of the clock change', async () => {
    await publishDirectly(workspace.id, rosterId, [
      { seatId: seat('early', '2027-03-26'), personId: me.id },
      { seatId: seat('early', '2027-03-26', 1), personId: colleague.id },
      { seatId: seat('early', '2027-03-27'), personId: me.id },
      { seatId: seat('night', '2027-03-27'), personId: me.id },
      { seatId: seat('early', '2027-03-28'), personId: me.id },
      { seatId: seat('early', '2027-03-29'), personId: me.id },
      { seatId: seat('early', '2027-03-31'), personId: colleague.id },
    ]);
    const res = await request(app).get(feedPath);
    expect(res.status).toBe(200);
    // RFC 5545 §3.1: CRLF line ends, content lines at most 75 octets, long ones folded.
    expect(res.text.replace(/\r\n/g, '').includes('\n')).toBe(false);
    for (const line of res.text.split('\r\n')) expect(Buffer.byteLength(line, 'utf8')).toBeLessThanOrEqual(75);
    expect(res.text).toMatch(/\r\n /);

    first = parse(res.text);
    const got = Object.fromEntries(first.map((e) => [`${e.summary.split(' ')[0]} ${e.start.slice(0, 10)}`, [e.start, e.end]]));
    expect(got).toEqual({
      'early 2027-03-26': EXPECTED['early 2027-03-26'],
      'early 2027-03-27': EXPECTED['early 2027-03-27'],
      'night 2027-03-27': EXPECTED['night 2027-03-27'],
      'early 2027-03-28': EXPECTED['early 2027-03-28'],
      'early 2027-03-29': EXPECTED['early 2027-03-29'],
    });
    expect(new Set(first.map((e) => e.uid)).size).toBe(5);
    // Local times in the workspace's zone (RFC 5545 §3.3.5 form #3) with the zone's VTIMEZONE (§3.6.5),
    // and the instants above are what ical.js makes of them from that VTIMEZONE.
    expect(workspace.timeZone).toBe('Europe/London');
    expect(res.text).toContain('BEGIN:VTIMEZONE\r\nTZID:Europe/London\r\n');
    expect(first.map((e) => e.startZone)).toEqual(Array(5).fill('Europe/London'));
    // Co-workers by name (unfolded intact by the parser); the colleague's own shift on the 31st is not in this feed.
    expect(first.find((e) => e.start === EXPECTED['early 2027-03-26'][0])!.description).toContain(`With ${colleague.name}.`);
    expect(first.some((e) => e.start.startsWith('2027-03-31'))).toBe(false);
    // My shifts say the same, in local time and hours.
    const mine = (await staff.get('/api/me/shifts').query({ week: '2027-03-27' })).body;
    const night = mine.shifts.find((s: { label: string }) => s.label === 'night');
    expect(night).toMatchObject({ startsLocal: '2027-03-27T21:00', endsLocal: '2027-03-28T07:00', startsAt: EXPECTED['night 2027-03-27'][0], endsAt: EXPECTED['night 2027-03-27'][1], hours: 9 });
    // Week Mon 22 – Sun 28 March: earlies on 26, 27, 28 (8 h each) and the 9-hour night.
    expect(mine.week).toMatchObject({ start: '2027-03-22', end: '2027-03-28', hours: 33, shifts: 4 });
  });

  it('updates on re-publish: the same UID per seat with a higher SEQUENCE and a new DTSTAMP; dropped shifts leave', async () => {
    await publishDirectly(workspace.id, rosterId, [
      { seatId: seat('early', '2027-03-26'), personId: me.id },
      { seatId: seat('early', '2027-03-26', 1), personId: colleague.id },
      { seatId: seat('early', '2027-03-27'), personId: me.id },
      { seatId: seat('night', '2027-03-27'), personId: me.id },
      { seatId: seat('early', '2027-03-28'), personId: me.id },
      { seatId: seat('early', '2027-03-30'), personId: me.id }, // Monday 29 moved to Tuesday 30
    ]);
    const second = parse((await request(app).get(feedPath)).text);
    expect(second.map((e) => e.start).sort()).toEqual(
      [EXPECTED['early 2027-03-26'], EXPECTED['early 2027-03-27'], EXPECTED['night 2027-03-27'], EXPECTED['early 2027-03-28'], EXPECTED['early 2027-03-30']].map((x) => x[0]).sort(),
    );
    for (const kept of second.filter((e) => !e.start.startsWith('2027-03-30'))) {
      const before = first.find((e) => e.uid === kept.uid);
      expect(before, kept.uid).toBeDefined();
      expect(kept.start).toBe(before!.start);
      expect(kept.sequence).toBeGreaterThan(before!.sequence);
      expect(new Date(kept.stamp).getTime()).toBeGreaterThan(new Date(before!.stamp).getTime());
    }
    expect(second.some((e) => e.start.startsWith('2027-03-29'))).toBe(false);
    expect(first.find((e) => e.start.startsWith('2027-03-26'))!.description).toContain('With');
    expect(second.find((e) => e.start.startsWith('2027-03-30'))!.description).toContain('No one else on this shift.');
  });

  it('answers an empty 404 for a reset, unknown, malformed or stopped token', async () => {
    const reset = await staff.post('/api/me/feed');
    expect(reset.status).toBe(201);
    const fresh = pathOf(reset.body.url);
    expect(fresh).not.toBe(feedPath);
    for (const path of [feedPath, '/api/feeds/AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA.ics', '/api/feeds/not-a-token.ics', `/api/feeds/${'x'.repeat(500)}.ics`]) {
      const res = await request(app).get(path);
      expect(res.status, path.slice(0, 60)).toBe(404);
      expect(res.text).toBe('');
    }
    expect(parse((await request(app).get(fresh)).text)).toHaveLength(5);
    expect((await staff.delete('/api/me/feed')).status).toBe(204);
    const stopped = await request(app).get(fresh);
    expect(stopped.status).toBe(404);
    expect(stopped.text).toBe('');
    const [rows] = await db.sequelize.query('SELECT * FROM calendar_feeds');
    expect(rows).toHaveLength(0);
  });
});
