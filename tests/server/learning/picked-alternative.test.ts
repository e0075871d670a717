import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import type { Workspace } from '../../../server/db/models';
import { RunWorker } from '../../../server/runs/worker';
import { PreferenceRow } from '../../../server/learning/models';
import { assembleRoster } from '../../../server/rosters/assemble';
import { scoreRoster } from '../../../solver/roster';
import type { Roster, RosterAssignment } from '../../../shared/roster/schema';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];
type Run = { id: number; assignments: Array<{ seatId: number; personId: number | null }> };
type Alternatives = { current: { personId: number | null }; alternatives: Array<{ personId: number | null; feasible: boolean; scoreChange: number | null; otherSeats: Array<{ seatId: number; personId: number | null }> }> };

/**
 * A seat alternative the coordinator picks is recorded as a preference: the roster behind the
 * alternative kept over the run's roster. The roster is tiny (three people, two seats on each of
 * two days: 4^4 = 256 rosters), so the kept roster is checked against exhaustive enumeration: it
 * is a best roster with the picked person in the seat (the max-marginal), scored with scoreRoster.
 */
describe('picked seat alternatives as preferences', () => {
  let db: TestDb;
  let app: Express;
  let workspace: Workspace;
  let coordinator: Agent;
  let staff: Agent;
  let worker: RunWorker;
  let rosterId: number;
  let run: Run;
  let people: Array<{ id: number; name: string }>;

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    workspace = await makeWorkspace('Thornbury Dispensary');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    staff = (await signedIn(app, workspace, 'staff')).agent;
    worker = new RunWorker(db.sequelize, { name: 'picked-alternative-test-worker' });
    worker.startCompute(); // the alternatives are a job the API waits for
    people = [];
    for (const [name, hours] of [['Edda Fairoak', 16], ['Fenn Glenholt', 16], ['Greta Hartwell', 8]] as const) {
      const res = await coordinator.post('/api/people').send({ name, contractedHours: hours, skillIds: [] });
      expect(res.status).toBe(201);
      people.push(res.body);
    }
    const roster = await coordinator.post('/api/rosters').send({ name: 'Thornbury, two days', periodStart: '2027-05-03', periodEnd: '2027-05-04', timeZone: 'Europe/London' });
    rosterId = roster.body.id;
    const pattern = await coordinator.post(`/api/rosters/${rosterId}/patterns`).send({ label: 'day', weekdays: ['mon', 'tue'], startTime: '08:00', endTime: '16:00', seats: [{ skillId: null, count: 2 }] });
    expect(pattern.status).toBe(201);
    const wish = await coordinator.post(`/api/rosters/${rosterId}/wishes`).send({ personId: people[2].id, date: '2027-05-03', kind: 'prefer', strength: 2 });
    expect(wish.status).toBe(201);
    const start = await coordinator.post(`/api/rosters/${rosterId}/runs`).send({ timeLimitSeconds: 2, seed: 1 });
    expect(start.status).toBe(202);
    expect(await worker.tick()).toBe(start.body.id);
    run = (await coordinator.get(`/api/runs/${start.body.id}`)).body;
  }, 120_000);
  afterAll(async () => {
    await worker.stop();
    await db.drop();
  });

  /** Best scoreRoster total over every roster with `seat` held by `person` (each seat: open or one of the people). */
  const maxMarginal = (r: Roster, seat: string, person: string | null) => {
    const choices: Array<string | null> = [null, ...r.people.map((p) => p.id)];
    let best = -Infinity;
    const a: RosterAssignment = {};
    const visit = (i: number) => {
      if (i === r.seats.length) return void (best = Math.max(best, scoreRoster(r, a).total));
      const s = r.seats[i].id;
      for (const c of s === seat ? [person] : choices) {
        a[s] = c;
        visit(i + 1);
      }
    };
    visit(0);
    return best;
  };

  it('records the roster behind the picked alternative over the run, and counts it as an edit', { timeout: 120_000 }, async () => {
    const { parsed } = await assembleRoster(workspace.id, rosterId);
    if (!parsed.ok) throw new Error('roster invalid');
    const r = parsed.roster;
    const seatId = run.assignments[0].seatId;
    const alts = (await coordinator.get(`/api/runs/${run.id}/seats/${seatId}/alternatives`)).body as Alternatives;
    const pick = alts.alternatives.find((a) => a.feasible && a.personId !== null)!;
    expect(pick).toBeDefined();
    const before = await PreferenceRow.count({ where: { workspaceId: workspace.id } });
    const res = await coordinator.post(`/api/rosters/${rosterId}/preferences/alternative`).send({ runId: run.id, seatId, personId: pick.personId });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(await PreferenceRow.count({ where: { workspaceId: workspace.id } })).toBe(before + 1);
    const row = (await PreferenceRow.findByPk(res.body.preference.id))!;
    expect(row.source).toBe('alternative');
    expect(row.proposedRunId).toBe(run.id);
    const proposed = Object.fromEntries(run.assignments.map((a) => [`st${a.seatId}`, a.personId === null ? null : `p${a.personId}`]));
    expect(row.proposed).toEqual(proposed);
    expect(row.kept[`st${seatId}`]).toBe(`p${pick.personId}`);
    expect(row.seatsChanged).toBe(1 + pick.otherSeats.length);
    expect(Object.keys(row.kept).filter((s) => row.kept[s] !== proposed[s]).length).toBe(row.seatsChanged);
    // Outside check: the kept roster is a best roster with the picked person in the seat (enumeration of all 256).
    const best = maxMarginal(r, `st${seatId}`, `p${pick.personId}`);
    expect(scoreRoster(r, row.kept).total).toBeCloseTo(best, 6);
    expect(scoreRoster(r, row.kept).total - scoreRoster(r, proposed).total).toBeCloseTo(pick.scoreChange!, 6);
    const counted = await coordinator.get(`/api/rosters/${rosterId}/suggestion`);
    expect(counted.body.edits).toBe(before + 1);
  });

  it('refuses a pick that changes nothing, a seat or run not of this roster, and staff, naming the field; nothing is recorded', { timeout: 120_000 }, async () => {
    const before = await PreferenceRow.count();
    const seatId = run.assignments[0].seatId;
    const holder = run.assignments[0].personId;
    const same = await coordinator.post(`/api/rosters/${rosterId}/preferences/alternative`).send({ runId: run.id, seatId, personId: holder });
    expect(same.status).toBe(422);
    expect(same.body.error.fields[0].path).toBe('body.personId');
    const noSeat = await coordinator.post(`/api/rosters/${rosterId}/preferences/alternative`).send({ runId: run.id, seatId: 999_999, personId: null });
    expect(noSeat.status).toBe(422);
    expect(noSeat.body.error.fields[0].path).toBe('body.seatId');
    const noRun = await coordinator.post(`/api/rosters/${rosterId}/preferences/alternative`).send({ runId: 999_999, seatId, personId: null });
    expect(noRun.status).toBe(404);
    expect(noRun.body.error.fields[0].path).toBe('body.runId');
    const badBody = await coordinator.post(`/api/rosters/${rosterId}/preferences/alternative`).send({ runId: run.id, seatId, personId: 'someone' });
    expect(badBody.status).toBe(400);
    expect(badBody.body.error.fields[0].path).toBe('body.personId');
    expect((await staff.post(`/api/rosters/${rosterId}/preferences/alternative`).send({ runId: run.id, seatId, personId: null })).status).toBe(403);
    const other = await makeWorkspace('Elsewhere Dispensary');
    const them = (await signedIn(app, other, 'coordinator')).agent;
    expect((await them.post(`/api/rosters/${rosterId}/preferences/alternative`).send({ runId: run.id, seatId, personId: null })).status).toBe(404);
    expect(await PreferenceRow.count()).toBe(before);
  });
});
