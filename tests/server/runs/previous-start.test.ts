import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { TestDb } from '../helpers/test-db';
import type { signedIn } from '../auth/helpers';
import type { Workspace } from '../../../server/db/models';
import type { RunWorker } from '../../../server/runs/worker';
import { demoSetup } from './demo';
import { assembleRoster } from '../../../server/rosters/assemble';
import { scoreRoster } from '../../../solver/roster';
import { previousDual } from '../../../server/runs/repository';
import { RunRow } from '../../../server/rosters/models';

/**
 * On the Willowmere demo: a re-solve starts from the roster's latest run, so a short re-solve never
 * ends below the longer run before it (the independent scorer's totals), and pins still hold.
 * Without the previous start a 0.5 s solve from the greedy roster scored well below a 3 s one.
 */
describe('re-solves start from the latest run', () => {
  let db: TestDb;
  let workspace: Workspace;
  let coordinator: Awaited<ReturnType<typeof signedIn>>['agent'];
  let worker: RunWorker;
  beforeAll(async () => {
    ({ db, coordinator, worker, workspace } = await demoSetup('previous-start-worker'));
  }, 120_000);
  afterAll(async () => {
    await worker.stop();
    await db.drop();
  });

  /** Starts a run of the demo roster, lets the worker solve it, and answers the finished run. */
  const solveDone = async (rosterId: number, timeLimitSeconds: number, seed: number) => {
    const started = await coordinator.post(`/api/rosters/${rosterId}/runs`).send({ timeLimitSeconds, seed });
    expect(started.status).toBe(202);
    expect(await worker.tick()).toBe(started.body.id);
    const run = (await coordinator.get(`/api/runs/${started.body.id}`)).body;
    expect(run.status).toBe('done');
    return run;
  };

  it('a run keeps its bound\'s multipliers and the next run of the roster starts its bound there', { timeout: 180_000 }, async () => {
    const rosterId = (await coordinator.get('/api/rosters')).body.items[0].id as number;
    const solve = async (timeLimitSeconds: number) => (await solveDone(rosterId, timeLimitSeconds, 3)) as { id: number; bound: number; score: number };
    // 10 s: at 3 s the demo's Lagrangian may not get below MPLP's bound yet, and multipliers still at
    // zero are not kept (measured: bound 250 at 3 s, 90.75 with 1,369 multipliers at 6 s); a 6-s
    // wall-clock run on a machine at load 14 once kept none
    const first = await solve(10);
    const kept = await previousDual(workspace.id, rosterId, first.id + 1);
    // named by the roster's own ids (shift|person), so they survive recompiling the roster
    expect(kept).toBeTruthy();
    const names = Object.keys(kept!.mu);
    expect(names.length).toBeGreaterThan(0);
    for (const n of names.slice(0, 20)) expect(n).toMatch(/^sh\d+\|p\d+$/);
    // another roster's or a later run's multipliers are not picked
    expect(await previousDual(workspace.id, rosterId + 1000, first.id + 1)).toBeUndefined();
    expect(await previousDual(workspace.id, rosterId, first.id)).toBeUndefined();
    const second = await solve(4);
    // weak duality: L at the first run's multipliers is the first run's bound, and the second run
    // evaluates L there before any step, so its bound cannot be higher (a cold start of 3 s on the
    // demo ended at 250, MPLP's bound, when measured)
    expect(second.bound).toBeLessThanOrEqual(first.bound + 1e-9);
    expect(second.bound).toBeGreaterThanOrEqual(second.score);
    expect(await RunRow.count({ where: { rosterId } })).toBeGreaterThanOrEqual(2);
  });

  it('a short re-solve keeps the score of the longer run before it, and a new pin holds', { timeout: 180_000 }, async () => {
    const rosterId = (await coordinator.get('/api/rosters')).body.items[0].id as number;
    const solve = async (timeLimitSeconds: number) => {
      const run = await solveDone(rosterId, timeLimitSeconds, 2);
      const { parsed } = await assembleRoster(workspace.id, rosterId);
      if (!parsed.ok) throw new Error('demo roster invalid');
      const assignment = Object.fromEntries(run.assignments.map((x: { seatId: number; personId: number | null }) => [`st${x.seatId}`, x.personId === null ? null : `p${x.personId}`]));
      return { run, check: scoreRoster(parsed.roster, assignment) };
    };
    const first = await solve(3);
    expect(first.check.feasible).toBe(true);
    const second = await solve(0.5);
    expect(second.check.feasible).toBe(true);
    expect(second.check.total).toBeGreaterThanOrEqual(first.check.total - 1e-9);

    // Pin someone else into a filled seat; the next short run keeps the pin and stays feasible.
    const seat = second.run.assignments.find((x: { personId: number | null }) => x.personId !== null)!;
    const alternatives = (await coordinator.get(`/api/runs/${second.run.id}/seats/${seat.seatId}/alternatives`)).body;
    const other = alternatives.alternatives.find((x: { personId: number | null; feasible: boolean }) => x.personId !== null && x.feasible);
    expect(other).toBeTruthy();
    expect((await coordinator.put(`/api/rosters/${rosterId}/pins`).send({ seatId: seat.seatId, personId: other.personId })).status).toBeLessThan(300);
    const third = await solve(0.5);
    expect(third.check.feasible).toBe(true);
    expect(third.run.assignments.find((x: { seatId: number }) => x.seatId === seat.seatId).personId).toBe(other.personId);
  });
});
