import { monitorEventLoopDelay } from 'node:perf_hooks';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { TestDb } from '../helpers/test-db';
import type { signedIn } from '../auth/helpers';
import type { Workspace } from '../../../server/db/models';
import type { RunWorker } from '../../../server/runs/worker';
import { demoSetup } from './demo';
import { forgetSeatAlternatives } from '../../../server/runs/alternatives';
import { assembleRoster } from '../../../server/rosters/assemble';
import { scoreRoster } from '../../../solver/roster';
import type { SeatAlternativesAnswer } from '../../../shared/api/seat-alternatives';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

/**
 * Seat alternatives on the Willowmere demo (18 people, 4 weeks, 252 seats): too large to
 * enumerate, so each choice is forced and the roster repaired (achievable) with the dual bound
 * above it. What can be checked from outside the code under test: the change found is the
 * independent scorer's (scoreRoster on the roster as it stands) and never above the bound, the
 * run's own roster is a lower bound for keeping the holder, and the request stays fast; the
 * timings are printed for docs/solver.md.
 */
describe('seat alternatives on the demo roster', () => {
  let db: TestDb;
  let workspace: Workspace;
  let coordinator: Agent;
  let worker: RunWorker;
  let runId: number;
  let rosterId: number;

  beforeAll(async () => {
    ({ db, workspace, coordinator, worker } = await demoSetup('alternatives-demo-worker'));
    rosterId = (await coordinator.get('/api/rosters')).body.items[0].id;
    const start = await coordinator.post(`/api/rosters/${rosterId}/runs`).send({ timeLimitSeconds: 3, seed: 1 });
    expect(start.status).toBe(202);
    const t0 = Date.now();
    expect(await worker.tick()).toBe(start.body.id);
    console.log(`demo run (3 s solve + marginals): ${Date.now() - t0} ms`);
    runId = start.body.id;
  }, 180_000);
  afterAll(async () => {
    await worker.stop();
    await db.drop();
  });

  it('answers with achievable changes under their bounds, the contested share labelled approximate, fast and then from memory', { timeout: 120_000 }, async () => {
    const run = (await coordinator.get(`/api/runs/${runId}`)).body as { score: number; assignments: Array<{ seatId: number; personId: number | null }> };
    const filled = run.assignments.filter((a) => a.personId !== null);
    const seats = [filled[0].seatId, filled[40].seatId, filled[120].seatId];
    forgetSeatAlternatives();
    const times: string[] = [];
    for (const [k, seatId] of seats.entries()) {
      let t = Date.now();
      const res = await coordinator.get(`/api/runs/${runId}/seats/${seatId}/alternatives`);
      const cold = Date.now() - t;
      expect(res.status).toBe(200);
      const body = res.body as SeatAlternativesAnswer;
      expect(body.method).toBe('max-marginal');
      expect(body.exact).toBe(false);
      expect(body.score).toBeCloseTo(run.score, 6);
      expect(body.alternatives.length).toBeGreaterThan(0);
      for (const a of body.alternatives) {
        if (!a.feasible) continue;
        expect(a.scoreChangeAtMost).not.toBeNull();
        expect(a.scoreChange!).toBeLessThanOrEqual(a.scoreChangeAtMost! + 1e-6);
      }
      // The contest figures come from loopy sum-product on this model: the words say "approximate"
      // and leave the method's name to the details line (issue 20, fix 10).
      expect(body.contest).not.toBeNull();
      expect(body.contest!.exact).toBe(false);
      expect(body.contested).toMatch(/\(approximate\)\.$/);
      expect(body.contested).not.toMatch(/sum-product|bound|pass/);
      expect(body.methodWords).not.toMatch(/sum-product|dual|marginal/);
      expect(body.methodDetail).toMatch(/loopy sum-product, (converged|stopped) after \d+ pass/);
      expect(body.methodDetail).toMatch(/dual bound/);
      expect(body.contest!.holderProbability).toBeGreaterThan(0);
      expect(body.contest!.holderProbability).toBeLessThanOrEqual(body.contest!.holderOnShiftProbability + 1e-4);
      t = Date.now();
      const again = await coordinator.get(`/api/runs/${runId}/seats/${seatId}/alternatives`);
      const warm = Date.now() - t;
      expect(again.body.cached).toBe(true);
      expect(again.body.alternatives).toEqual(body.alternatives);
      times.push(`seat ${k + 1}: ${cold} ms${k === 0 ? ' (cold: compile, engine, dual pass)' : ' (model cached)'}, again ${warm} ms`);
      // Timings are printed, not asserted (the machine is shared); the second answer comes from memory
      expect(warm).toBeLessThan(cold);
    }
    console.log(`demo seat alternatives: ${times.join('; ')}`);
  });

  it('keeps the server responsive while working out a seat: the work runs in its own thread', { timeout: 120_000 }, async () => {
    const run = (await coordinator.get(`/api/runs/${runId}`)).body as { assignments: Array<{ seatId: number; personId: number | null }> };
    forgetSeatAlternatives();
    // Event-loop delay of this process (server and test share it) while a cold request is answered.
    const lag = monitorEventLoopDelay({ resolution: 10 });
    lag.enable();
    const res = await coordinator.get(`/api/runs/${runId}/seats/${run.assignments[7].seatId}/alternatives`);
    lag.disable();
    expect(res.status).toBe(200);
    const worstMs = lag.max / 1e6;
    console.log(`event-loop delay during a cold request: max ${worstMs.toFixed(0)} ms, mean ${(lag.mean / 1e6).toFixed(1)} ms`);
    // The answer takes seconds of solver work (a dual pass and repairs); were it done on this
    // thread, the loop would stall for all of it. Compiling the demo blocks it for ~150 ms in one
    // piece (measured, more on a loaded machine): a stall of a second or more means solver work here.
    expect(worstMs).toBeLessThan(1000);
  });

  it('a re-solve with the best alternative pinned keeps the pin and does not beat the alternative’s bound', { timeout: 180_000 }, async () => {
    const run = (await coordinator.get(`/api/runs/${runId}`)).body as { assignments: Array<{ seatId: number; personId: number | null }> };
    const seatId = run.assignments.find((a) => a.personId !== null)!.seatId;
    const body = (await coordinator.get(`/api/runs/${runId}/seats/${seatId}/alternatives`)).body as SeatAlternativesAnswer;
    const best = body.alternatives.find((a) => a.feasible && a.personId !== null)!;
    expect(best).toBeDefined();
    // Outside check: the roster with that person pinned there, solved again by a separate run and
    // scored by scoreRoster, can never beat the max-marginal's upper bound.
    expect((await coordinator.put(`/api/rosters/${rosterId}/pins`).send({ seatId, personId: best.personId })).status).toBe(200);
    const start = await coordinator.post(`/api/rosters/${rosterId}/runs`).send({ timeLimitSeconds: 3, seed: 1 });
    expect(await worker.tick()).toBe(start.body.id);
    const next = (await coordinator.get(`/api/runs/${start.body.id}`)).body as { score: number; assignments: Array<{ seatId: number; personId: number | null; pinned: boolean }> };
    expect(next.assignments.find((a) => a.seatId === seatId)).toMatchObject({ personId: best.personId, pinned: true });
    const { parsed } = await assembleRoster(workspace.id, rosterId);
    if (!parsed.ok) throw new Error('roster invalid');
    const solved = scoreRoster(parsed.roster, Object.fromEntries(next.assignments.map((a) => [`st${a.seatId}`, a.personId === null ? null : `p${a.personId}`]))).total;
    // No roster with the pin can beat the max-marginal's upper bound.
    expect(solved - body.score!).toBeLessThanOrEqual(best.scoreChangeAtMost! + 1e-6);
    console.log(`pinned ${best.name}: alternatives said ${best.scoreChange} (at most ${best.scoreChangeAtMost}); a 3 s re-solve with the pin gives ${(solved - body.score!).toFixed(2)}`);
    expect((await coordinator.delete(`/api/rosters/${rosterId}/pins/${seatId}`)).status).toBe(204);
  });
});
