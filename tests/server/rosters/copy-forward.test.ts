import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { addDays, eachDayOfInterval, format, getISODay, parseISO } from 'date-fns';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import type { Workspace } from '../../../server/db/models';
import { assembleRoster } from '../../../server/rosters/assemble';
import { makeApiRoster } from './fixtures';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

/**
 * Copy forward (issue 20): a new roster from an earlier one, the period moved; patterns, rules,
 * per-person terms and pairings carry over, wishes and absences do not. Dates are checked with
 * date-fns, an independent calendar, not with the project's own date code.
 */
describe('copy forward API', () => {
  let db: TestDb;
  let app: Express;
  let workspace: Workspace;
  let coordinator: Agent;

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    workspace = await makeWorkspace('Brackenfold Home');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
  });
  afterAll(async () => {
    await db.drop();
  });

  it('copies patterns (made afresh over the new period), hand-added shifts moved, rules and wish settings; not wishes', async () => {
    const { roster, people, firstAid } = await makeApiRoster(coordinator, workspace, {
      periodStart: '2027-03-01',
      periodEnd: '2027-03-14',
      patterns: [{ label: 'night', weekdays: ['sat', 'sun', 'mon'], startTime: '21:00', endTime: '07:00', seats: [{ skillId: null, count: 2 }] }],
    });
    // One shift added by hand, a rule changed, wish settings, a wish, an absence, a term, a pairing.
    const hand = await coordinator.post(`/api/rosters/${roster.id}/shifts`).send({ label: 'audit', startsLocal: '2027-03-10T09:00', endsLocal: '2027-03-10T13:00', seats: [{ skillId: firstAid.id }] });
    expect(hand.status).toBe(201);
    const rules = (await coordinator.get(`/api/rosters/${roster.id}/rules`)).body;
    const changedRules = { ...rules.rules, minRest: { ...rules.rules.minRest, hours: 12 } };
    expect((await coordinator.put(`/api/rosters/${roster.id}/rules`).send({ rules: changedRules, version: rules.version })).status).toBe(200);
    const current = (await coordinator.get(`/api/rosters/${roster.id}`)).body;
    const settings = await coordinator.patch(`/api/rosters/${roster.id}`).send({ wishDeadline: '2027-02-20T17:00:00.000Z', maxCannotDays: 3, version: current.version });
    expect(settings.status, JSON.stringify(settings.body)).toBe(200);
    expect((await coordinator.post(`/api/rosters/${roster.id}/wishes`).send({ personId: people[0].id, date: '2027-03-02', kind: 'avoid' })).status).toBe(201);
    expect((await coordinator.post(`/api/people/${people[1].id}/terms`).send({ term: { kind: 'noNights' }, effectiveFrom: '2027-01-01' })).status).toBe(201);
    expect((await coordinator.post('/api/pairings').send({ personAId: people[0].id, personBId: people[2].id, score: 4 })).status).toBe(201);

    // Four weeks later, so the new period is 29 March–11 April.
    const res = await coordinator.post(`/api/rosters/${roster.id}/copy-forward`).send({ name: 'Brackenfold, April', periodStart: '2027-03-29' });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const copy = res.body.roster;
    expect(copy).toMatchObject({ name: 'Brackenfold, April', periodStart: '2027-03-29', periodEnd: format(addDays(parseISO('2027-03-14'), 28), 'yyyy-MM-dd'), timeZone: 'Europe/London', status: 'draft', maxCannotDays: 3 });
    expect(res.body.shiftedByDays).toBe(28);
    // The deadline moves by the same 28 days.
    expect(copy.wishDeadline).toBe(addDays(new Date('2027-02-20T17:00:00.000Z'), 28).toISOString());

    // Nights on Sat, Sun and Mon of 29 Mar–11 Apr, counted with date-fns (ISO weekday 6, 7, 1).
    const nightDays = eachDayOfInterval({ start: parseISO('2027-03-29'), end: parseISO('2027-04-11') }).filter((d) => [6, 7, 1].includes(getISODay(d))).map((d) => format(d, 'yyyy-MM-dd'));
    const shifts = (await coordinator.get(`/api/rosters/${copy.id}/shifts`)).body.items as Array<{ label: string; startsLocal: string; endsLocal: string; patternId: number | null; seats: Array<{ skillId: number | null }> }>;
    const nights = shifts.filter((s) => s.label === 'night');
    expect(nights.map((s) => s.startsLocal.slice(0, 10))).toEqual(nightDays);
    expect(nights.every((s) => s.seats.length === 2 && s.patternId !== null)).toBe(true);
    // The night runs over midnight: it ends on the next calendar day.
    expect(nights[0].endsLocal).toBe(`${format(addDays(parseISO(nightDays[0]), 1), 'yyyy-MM-dd')}T07:00`);
    const audit = shifts.filter((s) => s.label === 'audit');
    expect(audit).toEqual([expect.objectContaining({ startsLocal: `${format(addDays(parseISO('2027-03-10'), 28), 'yyyy-MM-dd')}T09:00`, patternId: null, seats: [expect.objectContaining({ skillId: firstAid.id })] })]);
    expect(res.body.copied).toEqual({ patterns: 1, shiftsFromPatterns: nightDays.length, handShifts: 1, rules: true });
    const patterns = (await coordinator.get(`/api/rosters/${copy.id}/patterns`)).body.items;
    expect(patterns.map((p: { label: string; weekdays: string[] }) => [p.label, p.weekdays])).toEqual([['night', ['sat', 'sun', 'mon']]]);

    expect((await coordinator.get(`/api/rosters/${copy.id}/rules`)).body.rules).toEqual(changedRules);
    expect((await coordinator.get(`/api/rosters/${copy.id}/wishes`)).body.items).toEqual([]);
    expect(res.body.leftBehind).toEqual({ wishes: 1 });

    // What the solver sees for the new roster: the same terms and pairings as the old one.
    const before = await assembleRoster(workspace.id, roster.id);
    const after = await assembleRoster(workspace.id, copy.id);
    expect(after.parsed.ok, JSON.stringify(after.parsed)).toBe(true);
    const termsOf = (r: typeof before) => r.input.people.filter((p) => p.terms?.length).map((p) => [p.id, p.terms]);
    expect(termsOf(after)).toEqual(termsOf(before));
    expect(termsOf(after)).toHaveLength(1);
    expect(after.input.pairings).toEqual(before.input.pairings);
    expect(after.input.pairings).toHaveLength(1);
    expect(res.body.inForce).toEqual({ peopleWithTerms: 1, pairings: 1 });
    expect(after.input.wishes).toEqual([]);
    expect(after.input.pins).toEqual([]);
    // The source roster is untouched.
    expect((await coordinator.get(`/api/rosters/${roster.id}/shifts`)).body.items).toHaveLength(nightDays.length + 1);
  });

  it('moved by part of a week: patterns still land on their weekdays, hand-added shifts keep their place in the period', async () => {
    const { roster } = await makeApiRoster(coordinator, workspace, { periodStart: '2027-06-07', periodEnd: '2027-06-13', patterns: [{ label: 'early', weekdays: ['mon', 'tue', 'wed', 'thu', 'fri'], startTime: '07:00', endTime: '15:00', seats: [{ skillId: null, count: 1 }] }] });
    expect((await coordinator.post(`/api/rosters/${roster.id}/shifts`).send({ label: 'extra', startsLocal: '2027-06-13T10:00', endsLocal: '2027-06-13T14:00', seats: [{ skillId: null }] })).status).toBe(201);
    // Ten days on: 17–23 June (Thursday to Wednesday); the Mon–Fri pattern lands on 17, 18, 21, 22, 23 June.
    const res = await coordinator.post(`/api/rosters/${roster.id}/copy-forward`).send({ name: 'Ten days on', periodStart: '2027-06-17' });
    expect(res.status).toBe(201);
    expect(res.body.roster.periodEnd).toBe('2027-06-23');
    const weekdays = eachDayOfInterval({ start: parseISO('2027-06-17'), end: parseISO('2027-06-23') }).filter((d) => getISODay(d) <= 5).map((d) => format(d, 'yyyy-MM-dd'));
    const shifts = (await coordinator.get(`/api/rosters/${res.body.roster.id}/shifts`)).body.items as Array<{ label: string; startsLocal: string }>;
    expect(shifts.filter((s) => s.label === 'early').map((s) => s.startsLocal.slice(0, 10))).toEqual(weekdays);
    // The last day's extra shift is on the new last day: 13 June + 10 days.
    expect(shifts.filter((s) => s.label === 'extra').map((s) => s.startsLocal)).toEqual([`${format(addDays(parseISO('2027-06-13'), 10), 'yyyy-MM-dd')}T10:00`]);
  });

  it('refuses bad input with the field named, another workspace’s roster with 404, and the same period with 422', async () => {
    const { roster } = await makeApiRoster(coordinator, workspace, { patterns: [] });
    const badDate = await coordinator.post(`/api/rosters/${roster.id}/copy-forward`).send({ name: 'X', periodStart: '2027-02-30' });
    expect(badDate.status).toBe(400);
    expect(badDate.body.error.fields[0].path).toBe('body.periodStart');
    const noName = await coordinator.post(`/api/rosters/${roster.id}/copy-forward`).send({ name: '  ', periodStart: '2027-04-05' });
    expect(noName.status).toBe(400);
    expect(noName.body.error.fields[0].path).toBe('body.name');
    const extra = await coordinator.post(`/api/rosters/${roster.id}/copy-forward`).send({ name: 'X', periodStart: '2027-04-05', wishes: true });
    expect(extra.status).toBe(400);
    const same = await coordinator.post(`/api/rosters/${roster.id}/copy-forward`).send({ name: 'Same', periodStart: '2027-03-01' });
    expect(same.status).toBe(422);
    expect(same.body.error.fields[0].path).toBe('body.periodStart');
    const far = await coordinator.post(`/api/rosters/${roster.id}/copy-forward`).send({ name: 'Far', periodStart: '9999-12-30' });
    expect(far.status).toBe(422);
    const other = await makeWorkspace('Elsewhere Lodge');
    const stranger = (await signedIn(app, other, 'coordinator')).agent;
    expect((await stranger.post(`/api/rosters/${roster.id}/copy-forward`).send({ name: 'Mine now', periodStart: '2027-04-05' })).status).toBe(404);
    const staff = (await signedIn(app, workspace, 'staff')).agent;
    expect((await staff.post(`/api/rosters/${roster.id}/copy-forward`).send({ name: 'Staff copy', periodStart: '2027-04-05' })).status).toBe(403);
  });

  it('counts against the free plan’s one roster in progress like any new roster (402)', async () => {
    const small = await makeWorkspace('Tiny Croft', { plan: 'free' });
    const coord = (await signedIn(app, small, 'coordinator')).agent;
    const first = await coord.post('/api/rosters').send({ name: 'Only one', periodStart: '2027-05-03', periodEnd: '2027-05-09', timeZone: 'Europe/London' });
    expect(first.status).toBe(201);
    const copy = await coord.post(`/api/rosters/${first.body.id}/copy-forward`).send({ name: 'A second', periodStart: '2027-05-10' });
    expect(copy.status).toBe(402);
    expect(copy.body.error.limit).toMatchObject({ name: 'activeRosters', max: 1, current: 1 });
  });
});
