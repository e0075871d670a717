import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makePerson, makeWorkspace, signedIn } from '../auth/helpers';
import { PersonTermRow } from '../../../server/terms/models';
import { assembleRoster } from '../../../server/rosters/assemble';
import type { Workspace } from '../../../server/db/models';
import { makeApiRoster } from '../rosters/fixtures';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

describe('per-person terms API: kept with an effective-from date, reaching the roster format', () => {
  let db: TestDb;
  let app: Express;
  let workspace: Workspace;
  let other: Workspace;
  let coordinator: Agent;
  let staff: Agent;
  let personId: number;
  let foreignPersonId: number;

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    workspace = await makeWorkspace('Larkspur Clinic');
    other = await makeWorkspace('Elsewhere Kitchen');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    staff = (await signedIn(app, workspace, 'staff')).agent;
    personId = (await makePerson(workspace, { name: 'Wren Calloway' })).id;
    foreignPersonId = (await makePerson(other, { name: 'Not Ours' })).id;
  });
  afterAll(async () => {
    await db.drop();
  });

  it('adds, lists in words, edits with the version seen, and deletes a term', async () => {
    const made = await coordinator.post(`/api/people/${personId}/terms`).send({ term: { kind: 'noNights' }, effectiveFrom: '2027-01-01' });
    expect(made.status).toBe(201);
    expect(made.body).toMatchObject({ personId, effectiveFrom: '2027-01-01', term: { kind: 'noNights', hard: true, weight: 10 }, words: 'No night shifts (hard)', version: 1 });
    const soft = await coordinator.post(`/api/people/${personId}/terms`).send({ term: { kind: 'maxShiftsPerWeek', count: 3, hard: false, weight: 4 }, effectiveFrom: '2027-03-03' });
    expect(soft.body.words).toBe('At most 3 shifts a week (soft, 4 points a shift)');
    const list = await coordinator.get(`/api/people/${personId}/terms`);
    expect(list.body.items.map((t: { term: { kind: string } }) => t.term.kind)).toEqual(['noNights', 'maxShiftsPerWeek']);

    const edited = await coordinator.patch(`/api/people/${personId}/terms/${soft.body.id}`).send({ term: { kind: 'maxShiftsPerWeek', count: 4, hard: false, weight: 4 }, version: 1 });
    expect(edited.status).toBe(200);
    expect(edited.body).toMatchObject({ version: 2, term: { count: 4 } });
    const stale = await coordinator.patch(`/api/people/${personId}/terms/${soft.body.id}`).send({ effectiveFrom: '2027-04-01', version: 1 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.fields[0].path).toBe('body.version');
    expect((await PersonTermRow.findByPk(soft.body.id))!.effectiveFrom).toBe('2027-03-03');

    const gone = await coordinator.delete(`/api/people/${personId}/terms/${soft.body.id}`);
    expect(gone.status).toBe(204);
    expect((await coordinator.get(`/api/people/${personId}/terms`)).body.items).toHaveLength(1);
  });

  it('refuses bad terms with the field named and changes nothing', async () => {
    const before = await PersonTermRow.count();
    const cases: [unknown, string][] = [
      [{ term: { kind: 'maxNights', count: -1 }, effectiveFrom: '2027-01-01' }, 'body.term.count'],
      [{ term: { kind: 'sometimes' }, effectiveFrom: '2027-01-01' }, 'body.term.kind'],
      [{ term: { kind: 'earliestStart', time: '25:00' }, effectiveFrom: '2027-01-01' }, 'body.term.time'],
      [{ term: { kind: 'daysOff', weekdays: [] }, effectiveFrom: '2027-01-01' }, 'body.term.weekdays'],
      [{ term: { kind: 'noNights' }, effectiveFrom: '2027-02-30' }, 'body.effectiveFrom'],
    ];
    for (const [body, field] of cases) {
      const res = await coordinator.post(`/api/people/${personId}/terms`).send(body as object);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(res.body.error.fields.map((f: { path: string }) => f.path)).toContain(field);
    }
    expect(await PersonTermRow.count()).toBe(before);
  });

  it('keeps terms inside the workspace and away from staff', async () => {
    expect((await coordinator.get(`/api/people/${foreignPersonId}/terms`)).status).toBe(404);
    expect((await coordinator.post(`/api/people/${foreignPersonId}/terms`).send({ term: { kind: 'noNights' }, effectiveFrom: '2027-01-01' })).status).toBe(404);
    expect((await staff.get(`/api/people/${personId}/terms`)).status).toBe(403);
    expect((await staff.post(`/api/people/${personId}/terms`).send({ term: { kind: 'noNights' }, effectiveFrom: '2027-01-01' })).status).toBe(403);
  });

  it('puts the terms in effect during a roster into its roster JSON, dated from when they start', async () => {
    const { roster, people } = await makeApiRoster(coordinator, workspace, { people: 3, periodStart: '2027-03-01', periodEnd: '2027-03-07' });
    const [a, b] = people;
    await coordinator.post(`/api/people/${a.id}/terms`).send({ term: { kind: 'daysOff', weekdays: ['mon'] }, effectiveFrom: '2026-12-01' });
    await coordinator.post(`/api/people/${a.id}/terms`).send({ term: { kind: 'maxHours', hours: 16, hard: false, weight: 2 }, effectiveFrom: '2027-03-04' });
    // starts after the roster's last day: not in this roster
    await coordinator.post(`/api/people/${b.id}/terms`).send({ term: { kind: 'noNights' }, effectiveFrom: '2027-03-08' });
    const { parsed } = await assembleRoster(workspace.id, roster.id);
    expect(parsed.ok).toBe(true);
    if (!parsed.ok) return;
    const byName = new Map(parsed.roster.people.map((p) => [p.name, p.terms]));
    expect(byName.get(a.name)).toEqual([
      { kind: 'daysOff', weekdays: ['mon'], hard: true, weight: 10 },
      { kind: 'maxHours', hours: 16, hard: false, weight: 2, from: '2027-03-04' },
    ]);
    expect(byName.get(b.name)).toEqual([]);
  });
});
