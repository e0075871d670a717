import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import type { User, Workspace } from '../../../server/db/models';
import { WishRow } from '../../../server/rosters/models';
import { assembleRoster } from '../../../server/rosters/assemble';
import { makeApiRoster } from './fixtures';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

describe("coordinators' wishes view: wishes on behalf of anyone, who entered them, who is silent", () => {
  let db: TestDb;
  let app: Express;
  let workspace: Workspace;
  let coordinator: Agent;
  let coordinatorUser: User;
  let staff: Agent;
  let rosterId: number;
  let people: Array<{ id: number; name: string }>;

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    workspace = await makeWorkspace('Thornbury Lab');
    ({ agent: coordinator, user: coordinatorUser } = await signedIn(app, workspace, 'coordinator'));
    staff = (await signedIn(app, workspace, 'staff')).agent;
    const made = await makeApiRoster(coordinator, workspace, { people: 4 });
    rosterId = made.roster.id;
    people = made.people;
  });
  afterAll(async () => {
    await db.drop();
  });

  it('enters three wishes for a person with no login and shows who entered them and when', async () => {
    const [noLogin] = people;
    for (const [date, kind] of [['2027-03-02', 'cannot'], ['2027-03-03', 'avoid'], ['2027-03-04', 'prefer']] as const) {
      const res = await coordinator.post(`/api/rosters/${rosterId}/wishes`).send({ personId: noLogin.id, date, kind, strength: 3 });
      expect(res.status).toBe(201);
    }
    const view = await coordinator.get(`/api/rosters/${rosterId}/wishes`);
    expect(view.status).toBe(200);
    expect(view.body.items).toHaveLength(3);
    for (const w of view.body.items) {
      expect(w).toMatchObject({ personId: noLogin.id, enteredByName: coordinatorUser.displayName });
      expect(Date.parse(w.createdAt)).toBeGreaterThan(Date.now() - 60_000);
    }
    expect(view.body.silent.map((s: { name: string }) => s.name)).toEqual(people.slice(1).map((p) => p.name).sort());
    // the roster the solver reads carries them
    const { parsed } = await assembleRoster(workspace.id, rosterId);
    expect(parsed.ok && parsed.roster.wishes.map((w) => w.kind)).toEqual(['cannot', 'avoid', 'prefer']);
  });

  it('edits a wish in place and refuses an empty edit naming the field', async () => {
    const view = await coordinator.get(`/api/rosters/${rosterId}/wishes`);
    const avoid = view.body.items.find((w: { kind: string }) => w.kind === 'avoid');
    const res = await coordinator.patch(`/api/rosters/${rosterId}/wishes/${avoid.id}`).send({ kind: 'cannot', note: 'school run' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ kind: 'cannot', note: 'school run', enteredByName: coordinatorUser.displayName });
    const empty = await coordinator.patch(`/api/rosters/${rosterId}/wishes/${avoid.id}`).send({});
    expect(empty.status).toBe(400);
    expect(empty.body.error.fields[0].path).toBe('body.kind');
    expect((await WishRow.findByPk(avoid.id))!.kind).toBe('cannot');
    expect((await coordinator.patch(`/api/rosters/${rosterId}/wishes/999999`).send({ kind: 'avoid' })).status).toBe(404);
  });

  it('is for coordinators only', async () => {
    expect((await staff.get(`/api/rosters/${rosterId}/wishes`)).status).toBe(403);
    const any = await WishRow.findOne({ where: { rosterId } });
    expect((await staff.patch(`/api/rosters/${rosterId}/wishes/${any!.id}`).send({ kind: 'avoid' })).status).toBe(403);
  });
});
