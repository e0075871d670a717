import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import type { Workspace } from '../../../server/db/models';
import { RunWorker } from '../../../server/runs/worker';
import { PreferenceRow } from '../../../server/learning/models';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

/**
 * Suggestions from a coordinator's edits: each manual save based on a run is recorded as a
 * preference; fewer than 5 is a 422 naming the field; edits that undo each other are said to;
 * adopting changes the roster's rules and records who and when; staff may not see any of it.
 *
 * The roster: three people, one day shift of three seats Mon–Fri, so everyone works every day;
 * Cleo (16 h a week) would rather not work any day (an avoid wish of 7 points each). An open seat
 * costs 100, so the solver keeps her on; the coordinator keeps leaving her seats open, giving up
 * a seat for her wish and her contracted hours: their edits say an open seat weighs less, against
 * contracted hours, than the current weights say.
 */
describe('weight suggestions API', () => {
  let db: TestDb;
  let app: Express;
  let workspace: Workspace;
  let coordinator: Agent;
  let staff: Agent;
  let worker: RunWorker;
  let rosterId: number;
  let people: Array<{ id: number; name: string }>;

  const solve = async () => {
    const start = await coordinator.post(`/api/rosters/${rosterId}/runs`).send({ timeLimitSeconds: 2, seed: 1 });
    expect(start.status, JSON.stringify(start.body)).toBe(202);
    expect(await worker.tick()).toBe(start.body.id);
    return (await coordinator.get(`/api/runs/${start.body.id}`)).body as { id: number; assignments: Array<{ seatId: number; personId: number | null }> };
  };
  /** Saves the run with `seat` given to `person`, based on the run. */
  const save = async (run: { id: number; assignments: Array<{ seatId: number; personId: number | null }> }, seat: number, person: number | null) => {
    const roster = (await coordinator.get(`/api/rosters/${rosterId}`)).body;
    const assignment = Object.fromEntries(run.assignments.map((a) => [String(a.seatId), a.personId]));
    assignment[String(seat)] = person;
    const res = await coordinator.post(`/api/rosters/${rosterId}/manual-runs`).send({ assignment, version: roster.version, basedOnRunId: run.id });
    expect(res.status).toBe(201);
    return (await coordinator.get(`/api/runs/${res.body.runId}`)).body;
  };

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    workspace = await makeWorkspace('Sallowfield Lab');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    staff = (await signedIn(app, workspace, 'staff')).agent;
    worker = new RunWorker(db.sequelize, { name: 'suggestion-test-worker' });
    people = [];
    for (const [name, hours] of [['Ada Quarry', 40], ['Bram Oakhurst', 40], ['Cleo Redmarsh', 16]] as const) {
      const res = await coordinator.post('/api/people').send({ name, contractedHours: hours, skillIds: [] });
      expect(res.status).toBe(201);
      people.push(res.body);
    }
    const roster = await coordinator.post('/api/rosters').send({ name: 'Sallowfield, first week', periodStart: '2027-03-01', periodEnd: '2027-03-05', timeZone: 'Europe/London' });
    rosterId = roster.body.id;
    const pattern = await coordinator.post(`/api/rosters/${rosterId}/patterns`).send({ label: 'day', weekdays: ['mon', 'tue', 'wed', 'thu', 'fri'], startTime: '08:00', endTime: '16:00', seats: [{ skillId: null, count: 3 }] });
    expect(pattern.status).toBe(201);
    for (const day of ['01', '02', '03', '04', '05']) {
      const wish = await coordinator.post(`/api/rosters/${rosterId}/wishes`).send({ personId: people[2].id, date: `2027-03-${day}`, kind: 'avoid', strength: 7 });
      expect(wish.status).toBe(201);
    }
  });
  afterAll(async () => {
    await worker.stop();
    await db.drop();
  });

  it('refuses a suggestion before 5 edits, naming the field, and shows none', async () => {
    const none = await coordinator.get(`/api/rosters/${rosterId}/suggestion`);
    expect(none.status).toBe(200);
    expect(none.body).toMatchObject({ suggestion: null, edits: 0, minEdits: 5 });
    const early = await coordinator.post(`/api/rosters/${rosterId}/suggestion`);
    expect(early.status).toBe(422);
    expect(early.body.error.message).toMatch(/needs at least 5 edits/);
    expect(early.body.error.fields[0].path).toBe('edits');
    expect((await staff.get(`/api/rosters/${rosterId}/suggestion`)).status).toBe(403);
  });

  it('records each save based on a run as a preference; one that changes nothing is not', { timeout: 120_000 }, async () => {
    const run = await solve();
    const cleoSeats = run.assignments.filter((a) => a.personId === people[2].id);
    expect(cleoSeats.length).toBeGreaterThan(0);
    const before = await PreferenceRow.count();
    await save(run, run.assignments[0].seatId, run.assignments[0].personId); // no change
    expect(await PreferenceRow.count()).toBe(before);
  });

  it('says so when edits undo each other and too few are left', { timeout: 120_000 }, async () => {
    const run = await solve();
    const seat = run.assignments.find((a) => a.personId === people[2].id)!;
    // leave Cleo's seat open, put her back, then open it three more times: the second edit undoes each of the others
    const open = await save(run, seat.seatId, null);
    await save(open, seat.seatId, people[2].id);
    for (let i = 0; i < 3; i++) await save(run, seat.seatId, null);
    const res = await coordinator.post(`/api/rosters/${rosterId}/suggestion`);
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/contradict each other/);
  });

  it('learns from the edits, shows the suggestion in words, and adopting changes the rules on record', { timeout: 180_000 }, async () => {
    let run = await solve();
    for (const a of run.assignments.filter((x) => x.personId === people[2].id)) run = await save(run, a.seatId, null);
    for (let i = 0; i < 3; i++) {
      const fresh = await solve();
      const cleo = fresh.assignments.find((x) => x.personId === people[2].id);
      if (cleo) await save(fresh, cleo.seatId, null);
    }
    const res = await coordinator.post(`/api/rosters/${rosterId}/suggestion`);
    expect(res.status).toBe(201);
    const s = res.body.suggestion;
    expect(s.status).toBe('open');
    expect(s.report.words).toMatch(/^Your edits suggest: .* \(from \d+ edits over 1 roster\)$/);
    expect(s.report.contradictions.length).toBeGreaterThan(0);
    const cov = s.weights.find((w: { key: string }) => w.key === 'coverage');
    const contracted = s.weights.find((w: { key: string }) => w.key === 'contractedHours');
    // each edit gives up a seat (coverage) for 7 wish points and up to 8 hours nearer Cleo's contract
    expect(cov.to / Math.max(contracted.to, 1e-9)).toBeLessThan(cov.from / contracted.from);
    expect(s.report.agreeAfter).toBeGreaterThan(s.report.agreeBefore);
    // the suggestion explains more edits, so no 'no better' caution; a lowered open-seat weight is cautioned
    expect(s.report.cautions.join(' ')).not.toMatch(/no more than the current ones/);
    if (cov.to < cov.from) expect(s.report.cautions.join(' ')).toMatch(/Lower weights on .*every seat filled.*local law/);
    expect(s.report.past[0]).toMatchObject({ rosterId, rosterName: 'Sallowfield, first week' });

    const rulesBefore = (await coordinator.get(`/api/rosters/${rosterId}/rules`)).body.rules;
    expect((await staff.post(`/api/rosters/${rosterId}/suggestion/adopt`).send({ suggestionId: s.id })).status).toBe(403);
    const bad = await coordinator.post(`/api/rosters/${rosterId}/suggestion/adopt`).send({ suggestionId: 'x' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields[0].path).toBe('body.suggestionId');
    const adopted = await coordinator.post(`/api/rosters/${rosterId}/suggestion/adopt`).send({ suggestionId: s.id });
    expect(adopted.status).toBe(200);
    expect(adopted.body.suggestion).toMatchObject({ status: 'adopted', decidedBy: expect.any(String) });
    expect(adopted.body.suggestion.decidedAt).not.toBeNull();
    const rulesAfter = (await coordinator.get(`/api/rosters/${rosterId}/rules`)).body.rules;
    for (const w of s.weights) {
      expect(rulesBefore[w.key].weight).toBe(w.from);
      expect(rulesAfter[w.key].weight).toBe(w.to);
    }
    const again = await coordinator.post(`/api/rosters/${rosterId}/suggestion/dismiss`).send({ suggestionId: s.id });
    expect(again.status).toBe(409);
    const shown = await coordinator.get(`/api/rosters/${rosterId}/suggestion`);
    expect(shown.body.suggestion).toMatchObject({ id: s.id, status: 'adopted' });
  });

  it('keeps other workspaces out: their roster id is a 404', async () => {
    const other = await makeWorkspace('Elsewhere');
    const them = (await signedIn(app, other, 'coordinator')).agent;
    expect((await them.get(`/api/rosters/${rosterId}/suggestion`)).status).toBe(404);
    expect((await them.post(`/api/rosters/${rosterId}/suggestion`)).status).toBe(404);
  });
});
