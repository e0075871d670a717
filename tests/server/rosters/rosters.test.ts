import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eachDayOfInterval, isWeekend, parseISO } from 'date-fns';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import type { Workspace } from '../../../server/db/models';
import { Roster } from '../../../server/rosters/models';
import { makeApiRoster } from './fixtures';

describe('rosters, shift patterns, shifts, wishes and pairings API', () => {
  let db: TestDb;
  let app: Express;
  let workspace: Workspace;
  let coordinator: Awaited<ReturnType<typeof signedIn>>['agent'];

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    workspace = await makeWorkspace('Larkspur Clinic');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
  });
  afterAll(async () => {
    await db.drop();
  });

  it('generates one shift per matching weekday of the period, each with its seats', async () => {
    const { roster } = await makeApiRoster(coordinator, workspace, { periodStart: '2027-03-01', periodEnd: '2027-03-28' });
    const res = await coordinator.get(`/api/rosters/${roster.id}/shifts`);
    expect(res.status).toBe(200);
    // Independent count with date-fns: the weekdays (Mon–Fri) of 1–28 March 2027.
    const weekdays = eachDayOfInterval({ start: parseISO('2027-03-01'), end: parseISO('2027-03-28') }).filter((d) => !isWeekend(d)).length;
    expect(res.body.items).toHaveLength(weekdays);
    expect(res.body.items.every((s: { seats: unknown[] }) => s.seats.length === 2)).toBe(true);
    expect(res.body.items[0]).toMatchObject({ label: 'early', startsLocal: '2027-03-01T07:00', endsLocal: '2027-03-01T15:00' });
  });

  it('previews a night pattern that crosses midnight without saving it', async () => {
    const { roster } = await makeApiRoster(coordinator, workspace, { patterns: [] });
    const body = { label: 'night', weekdays: ['sat'], startTime: '21:00', endTime: '07:00', seats: [{ skillId: null, count: 2 }] };
    const preview = await coordinator.post(`/api/rosters/${roster.id}/patterns/preview`).send(body);
    expect(preview.status).toBe(200);
    expect(preview.body.items).toEqual([{ label: 'night', startsLocal: '2027-03-06T21:00', endsLocal: '2027-03-07T07:00', night: null, seats: [{ skillId: null }, { skillId: null }] }]);
    expect((await coordinator.get(`/api/rosters/${roster.id}/shifts`)).body.items).toEqual([]);
  });

  it('lists rosters a page at a time, sorted as asked', async () => {
    for (const [name, start] of [['Zinnia week', '2027-05-03'], ['Aster week', '2027-06-07']]) {
      await coordinator.post('/api/rosters').send({ name, periodStart: start, periodEnd: start.replace(/\d\d$/, '09'), timeZone: 'Europe/London' });
    }
    const page = await coordinator.get('/api/rosters?pageSize=1&page=1&sort=name&order=desc');
    expect(page.status).toBe(200);
    expect(page.body.pageSize).toBe(1);
    expect(page.body.items[0].name).toBe('Zinnia week');
    expect(page.body.total).toBeGreaterThanOrEqual(2);
    const bad = await coordinator.get('/api/rosters?sort=password');
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields[0].path).toBe('query.sort');
  });

  it('refuses a stale update with 409 and keeps the newer data', async () => {
    const created = await coordinator.post('/api/rosters').send({ name: 'April', periodStart: '2027-04-05', periodEnd: '2027-04-11', timeZone: 'Europe/London' });
    const first = await coordinator.patch(`/api/rosters/${created.body.id}`).send({ name: 'April (v2)', version: created.body.version });
    expect(first.status).toBe(200);
    expect(first.body.version).toBe(created.body.version + 1);
    const stale = await coordinator.patch(`/api/rosters/${created.body.id}`).send({ name: 'April (stale)', version: created.body.version });
    expect(stale.status).toBe(409);
    expect(stale.body.error.fields[0].path).toBe('body.version');
    expect((await coordinator.get(`/api/rosters/${created.body.id}`)).body.name).toBe('April (v2)');
    expect((await coordinator.delete(`/api/rosters/${created.body.id}`)).status).toBe(204);
    expect((await coordinator.get(`/api/rosters/${created.body.id}`)).status).toBe(404);
  });

  it.each([
    ['a period over 366 days', '/api/rosters', { name: 'Long', periodStart: '2027-01-01', periodEnd: '2028-01-05', timeZone: 'Europe/London' }, 'body.periodEnd'],
    ['a period ending before it starts', '/api/rosters', { name: 'Backwards', periodStart: '2027-01-10', periodEnd: '2027-01-01', timeZone: 'Europe/London' }, 'body.periodEnd'],
    ['an unknown time zone', '/api/rosters', { name: 'Nowhere', periodStart: '2027-01-01', periodEnd: '2027-01-07', timeZone: 'Mars/Olympus' }, 'body.timeZone'],
    ['a wrong type', '/api/people', { name: 'Typed', contractedHours: 'lots' }, 'body.contractedHours'],
    ['an over-long name', '/api/people', { name: 'x'.repeat(121), contractedHours: 10 }, 'body.name'],
  ])('rejects %s with a 400 naming the field', async (_label, url, body, field) => {
    const res = await coordinator.post(url).send(body);
    expect(res.status).toBe(400);
    expect(res.body.error.fields.map((f: { path: string }) => f.path)).toContain(field);
  });

  it('puts a solved roster back to draft when its rules change, as a shift edit does', async () => {
    const { roster } = await makeApiRoster(coordinator, workspace);
    // What the worker writes when a run finishes.
    await Roster.update({ status: 'solved' }, { where: { id: roster.id } });
    const rules = (await coordinator.get(`/api/rosters/${roster.id}/rules`)).body;
    const put = await coordinator.put(`/api/rosters/${roster.id}/rules`).send({ version: rules.version, rules: { ...rules.rules, coverage: { ...rules.rules.coverage, weight: rules.rules.coverage.weight + 1 } } });
    expect(put.status).toBe(200);
    expect((await coordinator.get(`/api/rosters/${roster.id}`)).body.status).toBe('draft');

    await Roster.update({ status: 'solved' }, { where: { id: roster.id } });
    const shifts = (await coordinator.get(`/api/rosters/${roster.id}/shifts`)).body.items;
    expect((await coordinator.patch(`/api/rosters/${roster.id}/shifts/${shifts[0].id}`).send({ version: shifts[0].version, label: 'early' })).status).toBe(200);
    expect((await coordinator.get(`/api/rosters/${roster.id}`)).body.status).toBe('draft');
  });

  it('rejects a shift that ends before it starts, and one outside the period', async () => {
    const { roster } = await makeApiRoster(coordinator, workspace, { patterns: [] });
    const backwards = await coordinator.post(`/api/rosters/${roster.id}/shifts`).send({ label: 'late', startsLocal: '2027-03-02T15:00', endsLocal: '2027-03-02T14:00', seats: [{ skillId: null }] });
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.fields[0].path).toBe('body.endsLocal');
    const outside = await coordinator.post(`/api/rosters/${roster.id}/shifts`).send({ label: 'late', startsLocal: '2027-04-02T15:00', endsLocal: '2027-04-02T22:00', seats: [{ skillId: null }] });
    expect(outside.status).toBe(422);
    expect(outside.body.error.fields[0].path).toBe('body.startsLocal');
  });

  it('rejects a pairing of a person with themself and unknown people', async () => {
    const { people } = await makeApiRoster(coordinator, workspace, { patterns: [] });
    const self = await coordinator.post('/api/pairings').send({ personAId: people[0].id, personBId: people[0].id, score: 3 });
    expect(self.status).toBe(400);
    expect(self.body.error.fields[0].path).toBe('body.personBId');
    const unknown = await coordinator.post('/api/pairings').send({ personAId: people[0].id, personBId: 999_999, score: 3 });
    expect(unknown.status).toBe(422);
    expect(unknown.body.error.fields[0].path).toBe('body.personBId');
    const ok = await coordinator.post('/api/pairings').send({ personAId: people[1].id, personBId: people[0].id, score: -4 });
    expect(ok.status).toBe(201);
    const twice = await coordinator.post('/api/pairings').send({ personAId: people[0].id, personBId: people[1].id, score: 2 });
    expect(twice.status).toBe(409);
  });

  it('rejects wishes for dates outside the period', async () => {
    const { roster, people } = await makeApiRoster(coordinator, workspace);
    const res = await coordinator.post(`/api/rosters/${roster.id}/wishes`).send({ personId: people[0].id, date: '2027-09-01', kind: 'cannot' });
    expect(res.status).toBe(422);
    expect(res.body.error.fields[0].path).toBe('body.date');
    const ok = await coordinator.post(`/api/rosters/${roster.id}/wishes`).send({ personId: people[0].id, date: '2027-03-02', kind: 'avoid', strength: 4 });
    expect(ok.status).toBe(201);
  });

  it('answers an oversized body with 413 and malformed JSON with 400', async () => {
    const big = await coordinator.post('/api/people').set('content-type', 'application/json').send(JSON.stringify({ name: 'x'.repeat(1_200_000), contractedHours: 1 }));
    expect(big.status).toBe(413);
    const broken = await coordinator.post('/api/people').set('content-type', 'application/json').send('{"name": ');
    expect(broken.status).toBe(400);
  });

  it('keeps staff out of coordinator routes and other workspaces out entirely', async () => {
    const { roster } = await makeApiRoster(coordinator, workspace);
    const staff = (await signedIn(app, workspace, 'staff')).agent;
    expect((await staff.get(`/api/rosters/${roster.id}`)).status).toBe(403);
    const other = await makeWorkspace('Foxglove Lab');
    const outsider = (await signedIn(app, other, 'coordinator')).agent;
    for (const url of [`/api/rosters/${roster.id}`, `/api/rosters/${roster.id}/shifts`, `/api/rosters/${roster.id}/rules`, `/api/rosters/${roster.id}/export`]) {
      expect((await outsider.get(url)).status).toBe(404);
    }
    expect((await outsider.patch(`/api/rosters/${roster.id}`).send({ name: 'mine now', version: 1 })).status).toBe(404);
  });
});
