import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import ICAL from 'ical.js';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, memoryMailer, signedIn } from '../auth/helpers';
import type { Workspace } from '../../../server/db/models';
import { RunWorker } from '../../../server/runs/worker';
import { assembleRoster } from '../../../server/rosters/assemble';
import { scoreRoster } from '../../../solver/roster';
import type { Roster } from '../../../shared/roster/schema';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

/**
 * The coordinator's workflow after a solve: concessions and their price, seat alternatives,
 * pins kept by a re-solve, hand-edited saves with the version check, publish with mail, and the
 * CSV and iCalendar files.
 *
 * The roster is small on purpose so every expected number has an outside source: exhaustive
 * enumeration of every roster (3 choices per seat), or a closed form from the rule weights.
 * Tuesday 6 July 2027 is in British Summer Time (UTC+1, Summer Time Order: last Sunday of March
 * to last Sunday of October), so 08:00 Europe/London is 07:00 UTC.
 */
describe('roster workflow API: concessions, alternatives, pins, manual saves, publish, exports', () => {
  let db: TestDb;
  let app: Express;
  let mailer: ReturnType<typeof memoryMailer>;
  let workspace: Workspace;
  let coordinator: Agent;
  let worker: RunWorker;
  let rosterId: number;
  let people: Array<{ id: number; name: string }>;
  let runId: number;

  const solve = async (body: Record<string, unknown> = { timeLimitSeconds: 2, seed: 1 }) => {
    const start = await coordinator.post(`/api/rosters/${rosterId}/runs`).send(body);
    expect(start.status).toBe(202);
    expect(await worker.tick()).toBe(start.body.id);
    const run = await coordinator.get(`/api/runs/${start.body.id}`);
    expect(run.body.status).toBe('done');
    return run.body as { id: number; score: number; assignments: Array<{ seatId: number; personId: number | null; pinned: boolean }>; result: { violations: Array<{ term: string; hard: boolean; points: number; message: string }> } };
  };

  /** Best score over every roster (each seat: open or one of the people), by brute force. */
  const bestByEnumeration = (r: Roster) => {
    const choices: Array<string | null> = [null, ...r.people.map((p) => p.id)];
    let best = -Infinity;
    const a: Record<string, string | null> = {};
    const visit = (i: number) => {
      if (i === r.seats.length) return void (best = Math.max(best, scoreRoster(r, a).total));
      for (const c of choices) {
        a[r.seats[i].id] = c;
        visit(i + 1);
      }
    };
    visit(0);
    return best;
  };

  beforeAll(async () => {
    db = await createTestDb();
    const made = makeApp(db);
    app = made.app;
    mailer = made.mailer;
    workspace = await makeWorkspace('Larchfield Clinic');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    worker = new RunWorker(db.sequelize, { name: 'workflow-test-worker' });
    worker.startCompute(); // prices and alternatives are jobs the API waits for

    // Two people (one with a long accented name, to exercise iCalendar line folding), one day shift
    // of two seats on Mon–Wed: 3 choices per seat, 3^6 = 729 rosters, few enough to enumerate.
    people = [];
    for (const [name, email] of [
      ['Aurélie Wintersgill-Featherstonehaugh of the Upper Ward, Night Team', 'aurelie@example.test'],
      ['Bram Ellery', null],
    ] as const) {
      const res = await coordinator.post('/api/people').send({ name, email, contractedHours: 0, skillIds: [] });
      expect(res.status).toBe(201);
      people.push(res.body);
    }
    const roster = await coordinator.post('/api/rosters').send({ name: 'Larchfield, early July', periodStart: '2027-07-05', periodEnd: '2027-07-07', timeZone: 'Europe/London' });
    rosterId = roster.body.id;
    const pattern = await coordinator
      .post(`/api/rosters/${rosterId}/patterns`)
      .send({ label: 'day', weekdays: ['mon', 'tue', 'wed'], startTime: '08:00', endTime: '16:00', seats: [{ skillId: null, count: 2 }] });
    expect(pattern.status).toBe(201);
    // Aurélie would rather not work Tuesday (7 points); an open seat costs 100, so the wish is given up.
    const wish = await coordinator.post(`/api/rosters/${rosterId}/wishes`).send({ personId: people[0].id, date: '2027-07-06', kind: 'avoid', strength: 7 });
    expect(wish.status).toBe(201);
  });
  afterAll(async () => {
    await worker.stop();
    await db.drop();
  });

  // Solves in worker threads: generous on a loaded machine.
  it('lists the concessions largest cost first and prices honouring one against exhaustive enumeration', { timeout: 180_000 }, async () => {
    const run = await solve();
    runId = run.id;
    // Closed form: everybody works every day (coverage 100 per seat beats the 7-point wish) → −7.
    expect(run.score).toBeCloseTo(-7, 6);

    const list = await coordinator.get(`/api/runs/${runId}/concessions`);
    expect(list.status).toBe(200);
    const costs = list.body.items.map((c: { points: number }) => c.points);
    expect(costs).toEqual([...costs].sort((a, b) => a - b));
    const wishIndex = list.body.items.findIndex((c: { term: string }) => c.term === 'wishes');
    expect(wishIndex).toBeGreaterThanOrEqual(0);
    expect(list.body.items[wishIndex].message).toMatch(/asked to avoid/);

    const priced = await coordinator.post(`/api/runs/${runId}/concession-price`).send({ index: wishIndex, timeLimitSeconds: 2 });
    expect(priced.status).toBe(200);
    expect(priced.body.method).toBe('resolve-enforced');
    expect(priced.body.feasible).toBe(true);
    // Outside check: the same roster with the wish made "cannot", every roster enumerated.
    const { parsed } = await assembleRoster(workspace.id, rosterId);
    if (!parsed.ok) throw new Error('roster invalid');
    const seat = parsed.roster.seats.find((s) => parsed.roster.shifts.find((sh) => sh.id === s.shift)!.start.startsWith('2027-07-06'))!;
    const enforced = { ...parsed.roster, wishes: [...parsed.roster.wishes, { person: `p${people[0].id}`, shift: seat.shift, kind: 'cannot' as const, strength: 0 }] };
    const best = bestByEnumeration(enforced);
    expect(best).toBeCloseTo(-100, 6); // one seat open on Tuesday, wish kept
    expect(priced.body.score).toBeCloseTo(best, 6);
    expect(priced.body.price).toBeCloseTo(-7 - best, 6); // 93 points
    expect(priced.body.words).toMatch(/costs about 93 points/);

    const missing = await coordinator.post(`/api/runs/${runId}/concession-price`).send({ index: 99 });
    expect(missing.status).toBe(404);
    expect(missing.body.error.message).toMatch(/numbered 0 to/);
    const badBody = await coordinator.post(`/api/runs/${runId}/concession-price`).send({ index: 0, timeLimitSeconds: 999 });
    expect(badBody.status).toBe(400);
    expect(badBody.body.error.fields[0].path).toBe('body.timeLimitSeconds');
  });

  it('says in words when honouring a concession is impossible', { timeout: 180_000 }, async () => {
    // One person, two seats on one shift: one seat must stay open, so "every seat filled" cannot be made hard.
    const solo = (await signedIn(app, await makeWorkspace('Solo Lodge'), 'coordinator')).agent;
    const person = await solo.post('/api/people').send({ name: 'Solo Carer', contractedHours: 0, skillIds: [] });
    expect(person.status).toBe(201);
    const r = await solo.post('/api/rosters').send({ name: 'Short-handed', periodStart: '2027-07-12', periodEnd: '2027-07-12', timeZone: 'Europe/London' });
    await solo.post(`/api/rosters/${r.body.id}/patterns`).send({ label: 'day', weekdays: ['mon'], startTime: '08:00', endTime: '16:00', seats: [{ skillId: null, count: 2 }] });
    const start = await solo.post(`/api/rosters/${r.body.id}/runs`).send({ timeLimitSeconds: 1 });
    expect(await worker.tick()).toBe(start.body.id);
    const list = await solo.get(`/api/runs/${start.body.id}/concessions`);
    const open = list.body.items.findIndex((c: { term: string }) => c.term === 'coverage');
    expect(open).toBeGreaterThanOrEqual(0);
    const priced = await solo.post(`/api/runs/${start.body.id}/concession-price`).send({ index: open, timeLimitSeconds: 1 });
    expect(priced.status).toBe(200);
    expect(priced.body.feasible).toBe(false);
    expect(priced.body.price).toBeNull();
    expect(priced.body.words).toMatch(/^Honouring this looks impossible/);
    expect(priced.body.words).not.toMatch(/at \w+ \(|Error/); // words, not a stack trace
  });

  /** Every roster of `r` (each seat open or one of the people) with its scoreRoster total: 3^6 = 729 here. */
  const everyRoster = (r: Roster) => {
    const choices: Array<string | null> = [null, ...r.people.map((p) => p.id)];
    const out: Array<{ a: Record<string, string | null>; score: number }> = [];
    const a: Record<string, string | null> = {};
    const visit = (i: number) => {
      if (i === r.seats.length) return void out.push({ a: { ...a }, score: scoreRoster(r, a).total });
      for (const c of choices) {
        a[r.seats[i].id] = c;
        visit(i + 1);
      }
    };
    visit(0);
    return out;
  };
  /** Max-marginal of seat = choice: the best score of any roster with that choice there (−Infinity: none keeps the hard rules). */
  const maxMarginal = (all: ReturnType<typeof everyRoster>, seat: string, choice: string | null) => Math.max(...all.filter((x) => x.a[seat] === choice).map((x) => x.score));
  /** P(event) under p(roster) ∝ exp(score), summed over every roster (log-sum-exp for safety). */
  const probability = (all: ReturnType<typeof everyRoster>, event: (a: Record<string, string | null>) => boolean) => {
    const top = Math.max(...all.map((x) => x.score));
    let z = 0, hit = 0;
    for (const x of all) {
      const w = Math.exp(x.score - top);
      z += w;
      if (event(x.a)) hit += w;
    }
    return hit / z;
  };
  const runRoster = (run: { assignments: Array<{ seatId: number; personId: number | null }> }) => Object.fromEntries(run.assignments.map((a) => [`st${a.seatId}`, a.personId === null ? null : `p${a.personId}`]));
  type AltBody = { method: string; exact: boolean; score: number; current: { personId: number | null }; contested: string; contest: { holderProbability: number; holderOnShiftProbability: number; exact: boolean; others: Array<{ personId: number | null; probability: number }> } | null; alternatives: Array<{ personId: number | null; feasible: boolean; impossible: boolean; scoreChange: number | null; scoreChangeAtMost: number | null; exact: boolean; otherSeatsMoved: number }> };

  it('gives every seat\'s alternatives as max-marginals and its contested share, both equal to brute-force enumeration', async () => {
    const run = (await coordinator.get(`/api/runs/${runId}`)).body;
    const { parsed } = await assembleRoster(workspace.id, rosterId);
    if (!parsed.ok) throw new Error('roster invalid');
    const r = parsed.roster;
    expect(r.pins).toEqual([]); // so the run's model and the alternatives' model are this roster
    // Outside check: every roster enumerated and scored with scoreRoster (729 rosters).
    const all = everyRoster(r);
    const chosen = runRoster(run);
    const chosenScore = scoreRoster(r, chosen).total;
    expect(chosenScore).toBeCloseTo(-7, 6);
    for (const seat of r.seats) {
      const seatId = Number(seat.id.slice(2));
      const res = await coordinator.get(`/api/runs/${runId}/seats/${seatId}/alternatives`);
      expect(res.status).toBe(200);
      const body = res.body as AltBody;
      expect(body.method).toBe('max-marginal');
      expect(body.exact).toBe(true);
      expect(body.score).toBeCloseTo(chosenScore, 6);
      const holder = chosen[seat.id];
      expect(body.current.personId).toBe(holder === null ? null : Number(holder.slice(1)));
      // One alternative per other choice: open and each person but the holder.
      const others = [null, ...r.people.map((p) => p.id)].filter((c) => c !== holder);
      expect(body.alternatives.map((a) => a.personId).sort()).toEqual(others.map((c) => (c === null ? null : Number(c.slice(1)))).sort());
      for (const alt of body.alternatives) {
        const choice = alt.personId === null ? null : `p${alt.personId}`;
        const mm = maxMarginal(all, seat.id, choice);
        expect(alt.exact).toBe(true);
        if (mm === -Infinity) {
          expect(alt).toMatchObject({ feasible: false, impossible: true, scoreChange: null });
        } else {
          expect(alt.feasible).toBe(true);
          expect(alt.scoreChange!).toBeCloseTo(mm - chosenScore, 6);
          expect(alt.scoreChangeAtMost!).toBeCloseTo(mm - chosenScore, 6);
        }
      }
      // How contested: the exact marginal P(seat = holder) ∝ Σ exp(score), and P(holder on the shift).
      expect(body.contest).not.toBeNull();
      expect(body.contest!.exact).toBe(true);
      expect(body.contest!.holderProbability).toBeCloseTo(probability(all, (a) => a[seat.id] === holder), 3);
      const shiftSeats = r.seats.filter((s) => s.shift === seat.shift).map((s) => s.id);
      if (holder !== null) expect(body.contest!.holderOnShiftProbability).toBeCloseTo(probability(all, (a) => shiftSeats.some((s) => a[s] === holder)), 3);
      for (const o of body.contest!.others) expect(o.probability).toBeCloseTo(probability(all, (a) => a[seat.id] === (o.personId === null ? null : `p${o.personId}`)), 3);
    }

    // Aurélie's Tuesday seat: leaving it open keeps her wish (+7) but costs an open seat (−100);
    // Bram can only take it if Aurélie moves to the other Tuesday seat (no change) — enumeration says the same.
    const tuesday = r.seats.filter((s) => r.shifts.find((sh) => sh.id === s.shift)!.start.startsWith('2027-07-06'));
    const hers = tuesday.find((s) => chosen[s.id] === `p${people[0].id}`)!;
    const res = (await coordinator.get(`/api/runs/${runId}/seats/${hers.id.slice(2)}/alternatives`)).body as AltBody;
    expect(res.alternatives.find((a) => a.personId === null)!.scoreChange).toBeCloseTo(-93, 6);
    const bram = res.alternatives.find((a) => a.personId === people[1].id)!;
    expect(bram.scoreChange).toBeCloseTo(0, 6);
    expect(bram.otherSeatsMoved).toBeGreaterThanOrEqual(1);
    // The two Tuesday seats are interchangeable: about half of the weight puts her in this very seat, nearly all on the shift.
    expect(res.contested).toMatch(/^Settled: over 99\s% of good rosters put Aurélie .* on this shift \(50\s% in this very seat/);
    // A second request is answered from memory, with the same figures.
    const again = (await coordinator.get(`/api/runs/${runId}/seats/${hers.id.slice(2)}/alternatives`)).body;
    expect(again.cached).toBe(true);
    expect(again.alternatives).toEqual(res.alternatives);
  });

  it('refuses bad seat-alternative requests with a 4xx naming the field', { timeout: 60_000 }, async () => {
    const unknown = await coordinator.get(`/api/runs/${runId}/seats/999999/alternatives`);
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.fields[0].path).toBe('params.seatId');
    const notANumber = await coordinator.get(`/api/runs/${runId}/seats/first/alternatives`);
    expect(notANumber.status).toBe(400);
    expect(notANumber.body.error.fields[0].path).toBe('params.seatId');
    const noRun = await coordinator.get(`/api/runs/999999/seats/1/alternatives`);
    expect(noRun.status).toBe(404);
    expect(noRun.body.error.fields[0].path).toBe('params.id');

    // Another workspace: its seat on our run is not a seat of this roster; our run is not theirs.
    const other = (await signedIn(app, await makeWorkspace('Elsewhere Grange'), 'coordinator')).agent;
    const theirRoster = await other.post('/api/rosters').send({ name: 'Elsewhere', periodStart: '2027-07-12', periodEnd: '2027-07-12', timeZone: 'Europe/London' });
    await other.post(`/api/rosters/${theirRoster.body.id}/patterns`).send({ label: 'day', weekdays: ['mon'], startTime: '08:00', endTime: '16:00', seats: [{ skillId: null, count: 1 }] });
    const theirSeat = (await other.get(`/api/rosters/${theirRoster.body.id}/shifts`)).body.items[0].seats[0].id as number;
    const foreignSeat = await coordinator.get(`/api/runs/${runId}/seats/${theirSeat}/alternatives`);
    expect(foreignSeat.status).toBe(404);
    expect(foreignSeat.body.error.fields[0].path).toBe('params.seatId');
    const ourSeat = (await coordinator.get(`/api/runs/${runId}`)).body.assignments[0].seatId;
    const foreignRun = await other.get(`/api/runs/${runId}/seats/${ourSeat}/alternatives`);
    expect(foreignRun.status).toBe(404);
    expect(foreignRun.body.error.fields[0].path).toBe('params.id');

    // A run that has not finished: 409 naming the run. (Cancelled again so the worker never takes it.)
    const queued = await coordinator.post(`/api/rosters/${rosterId}/runs`).send({ timeLimitSeconds: 1 });
    expect(queued.status).toBe(202);
    const waiting = await coordinator.get(`/api/runs/${queued.body.id}/seats/${ourSeat}/alternatives`);
    expect(waiting.status).toBe(409);
    expect(waiting.body.error.fields[0].path).toBe('params.id');
    expect(waiting.body.error.message).toMatch(/not finished/);
    expect((await coordinator.post(`/api/runs/${queued.body.id}/cancel`)).status).toBe(202);
  });

  // Solves in worker threads: generous on a loaded machine.
  it('keeps a pin through a re-solve', { timeout: 180_000 }, async () => {
    const shifts = (await coordinator.get(`/api/rosters/${rosterId}/shifts`)).body.items as Array<{ id: number; startsLocal: string; seats: Array<{ id: number }> }>;
    const monday = shifts.find((s) => s.startsLocal.startsWith('2027-07-05'))!;
    // Pin Monday's first seat open: the optimum now pays one open seat (−100) and the wish (−7).
    const pin = await coordinator.put(`/api/rosters/${rosterId}/pins`).send({ seatId: monday.seats[0].id, personId: null });
    expect(pin.status).toBe(200);
    const run = await solve();
    const pinned = run.assignments.find((a) => a.seatId === monday.seats[0].id)!;
    expect(pinned).toMatchObject({ personId: null, pinned: true });
    expect(run.score).toBeCloseTo(-107, 6);
    // The seat's own pin is what is being weighed: its alternatives are scored without it
    // (filling it again gains the 100-point open-seat penalty back).
    const alts = await coordinator.get(`/api/runs/${run.id}/seats/${monday.seats[0].id}/alternatives`);
    expect(alts.body.pinned).toEqual({ personId: null });
    const best = alts.body.alternatives[0];
    expect(best.feasible).toBe(true);
    expect(best.scoreChange).toBeCloseTo(100, 6);
    // Outside check: every roster without that pin enumerated; each change is the max-marginal minus the run's roster.
    const { parsed } = await assembleRoster(workspace.id, rosterId);
    if (!parsed.ok) throw new Error('roster invalid');
    const lifted = { ...parsed.roster, pins: [] };
    const all = everyRoster(lifted);
    const base = scoreRoster(lifted, runRoster(run)).total;
    for (const alt of alts.body.alternatives as AltBody['alternatives']) {
      expect(alt.scoreChange!).toBeCloseTo(maxMarginal(all, `st${monday.seats[0].id}`, alt.personId === null ? null : `p${alt.personId}`) - base, 6);
    }
    expect(alts.body.contested).toMatch(/^Pinned when this run was solved/);
    expect((await coordinator.delete(`/api/rosters/${rosterId}/pins/${monday.seats[0].id}`)).status).toBe(204);
    runId = (await solve()).id;
  });

  it('saves a hand-edited roster as a manual run, refuses a stale save with 409 and a broken one with 422', async () => {
    const run = (await coordinator.get(`/api/runs/${runId}`)).body;
    const roster = (await coordinator.get(`/api/rosters/${rosterId}`)).body;
    const assignment = Object.fromEntries(run.assignments.map((a: { seatId: number; personId: number | null }) => [String(a.seatId), a.personId]));
    const shifts = (await coordinator.get(`/api/rosters/${rosterId}/shifts`)).body.items as Array<{ startsLocal: string; seats: Array<{ id: number }> }>;
    const tuesday = shifts.find((s) => s.startsLocal.startsWith('2027-07-06'))!;
    // Hand edit: honour the wish by leaving Aurélie's Tuesday seat open.
    const hers = tuesday.seats.find((s) => assignment[String(s.id)] === people[0].id)!;
    const edited = { ...assignment, [String(hers.id)]: null };

    const live = await coordinator.post(`/api/rosters/${rosterId}/score`).send({ assignment: edited });
    expect(live.body.total).toBeCloseTo(-100, 6);

    const saved = await coordinator.post(`/api/rosters/${rosterId}/manual-runs`).send({ assignment: edited, version: roster.version, basedOnRunId: runId });
    expect(saved.status).toBe(201);
    expect(saved.body.score).toBeCloseTo(-100, 6);
    const manual = await coordinator.get(`/api/runs/${saved.body.runId}`);
    expect(manual.body.status).toBe('done');
    expect(manual.body.parameters.manual).toBe(true);
    expect(manual.body.assignments.find((a: { seatId: number }) => a.seatId === hers.id).personId).toBeNull();

    // A second editor who loaded the same version is told, and nothing is stored.
    const runsBefore = (await coordinator.get(`/api/rosters/${rosterId}/runs`)).body.items.length;
    const stale = await coordinator.post(`/api/rosters/${rosterId}/manual-runs`).send({ assignment, version: roster.version });
    expect(stale.status).toBe(409);
    expect(stale.body.error.message).toMatch(/Your edits are still on your screen/);
    expect((await coordinator.get(`/api/rosters/${rosterId}/runs`)).body.items.length).toBe(runsBefore);

    // The same person in both seats of a shift is a double booking: refused in words.
    const current = (await coordinator.get(`/api/rosters/${rosterId}`)).body;
    const doubled = { ...assignment, [String(tuesday.seats[0].id)]: people[1].id, [String(tuesday.seats[1].id)]: people[1].id };
    const broken = await coordinator.post(`/api/rosters/${rosterId}/manual-runs`).send({ assignment: doubled, version: current.version });
    expect(broken.status).toBe(422);
    expect(broken.body.error.message).toMatch(/hard rule/);
    const unknown = await coordinator.post(`/api/rosters/${rosterId}/manual-runs`).send({ assignment: { '999999': null }, version: current.version });
    expect(unknown.status).toBe(422);
    expect(unknown.body.error.fields[0].path).toBe('body.assignment.999999');
    const malformed = await coordinator.post(`/api/rosters/${rosterId}/manual-runs`).send({ assignment: { abc: 1 } });
    expect(malformed.status).toBe(400);
  });

  it('publishes: freezes the roster, mails each person with an address their own shifts, and lists the rest', async () => {
    const roster = (await coordinator.get(`/api/rosters/${rosterId}`)).body;
    const stale = await coordinator.post(`/api/rosters/${rosterId}/publish`).send({ runId, version: roster.version - 1 });
    expect(stale.status).toBe(409);
    const failedRun = await coordinator.post(`/api/rosters/${rosterId}/publish`).send({ runId: 999999, version: roster.version });
    expect(failedRun.status).toBe(422);
    expect(failedRun.body.error.fields[0].path).toBe('body.runId');

    const before = mailer.outbox.length;
    const res = await coordinator.post(`/api/rosters/${rosterId}/publish`).send({ runId, version: roster.version });
    expect(res.status).toBe(200);
    expect(res.body.roster.status).toBe('published');
    expect(res.body.mail.sent.map((m: { to: string }) => m.to)).toEqual(['aurelie@example.test']);
    expect(res.body.mail.noAddress.map((m: { name: string }) => m.name)).toEqual(['Bram Ellery']);
    const mails = mailer.outbox.slice(before);
    expect(mails).toHaveLength(1);
    expect(mails[0].subject).toBe('Your shifts: Larchfield, early July');
    // She works all three days in the published run (the wish was given up): three lines.
    expect(mails[0].text).toMatch(/Mon 5 Jul: day, 08:00–16:00/);
    expect(mails[0].text.match(/^- /gm)).toHaveLength(3);

    // Frozen: content changes and new runs are refused in words until reopened.
    const shifts = (await coordinator.get(`/api/rosters/${rosterId}/shifts`)).body.items as Array<{ seats: Array<{ id: number }> }>;
    const pin = await coordinator.put(`/api/rosters/${rosterId}/pins`).send({ seatId: shifts[0].seats[0].id, personId: null });
    expect(pin.status).toBe(409);
    expect(pin.body.error.message).toMatch(/published and frozen/);
    expect((await coordinator.post(`/api/rosters/${rosterId}/runs`).send({})).status).toBe(409);
    expect((await coordinator.post(`/api/rosters/${rosterId}/publish`).send({ runId, version: res.body.roster.version })).status).toBe(409);
  });

  it('exports the published roster as RFC 5545 iCalendar (parsed by ical.js) and RFC 4180 CSV', async () => {
    const all = await coordinator.get(`/api/rosters/${rosterId}/roster.ics`);
    expect(all.status).toBe(200);
    expect(all.headers['content-type']).toMatch(/^text\/calendar/);
    expect(all.headers['content-disposition']).toMatch(/attachment; filename=".*\.ics"/);
    const text = all.text;
    // RFC 5545 §3.1: CRLF line ends, content lines at most 75 octets.
    expect(text.endsWith('\r\n')).toBe(true);
    expect(text.replace(/\r\n/g, '').includes('\n')).toBe(false);
    for (const line of text.split('\r\n')) expect(Buffer.byteLength(line, 'utf8')).toBeLessThanOrEqual(75);
    expect(text).toMatch(/\r\n /); // the long name was folded

    const vcal = new ICAL.Component(ICAL.parse(text));
    const events = vcal.getAllSubcomponents('vevent').map((c) => new ICAL.Event(c));
    expect(events).toHaveLength(3);
    const uids = new Set(events.map((e) => e.uid));
    expect(uids.size).toBe(3);
    const tuesday = events.find((e) => e.startDate.toJSDate().toISOString().startsWith('2027-07-06'))!;
    expect(tuesday.startDate.toJSDate().toISOString()).toBe('2027-07-06T07:00:00.000Z'); // 08:00 BST
    expect(tuesday.endDate.toJSDate().toISOString()).toBe('2027-07-06T15:00:00.000Z');
    // Folding undone by the parser gives the full name back.
    expect(tuesday.description).toContain('Aurélie Wintersgill-Featherstonehaugh of the Upper Ward, Night Team');
    for (const c of vcal.getAllSubcomponents('vevent')) expect(c.getFirstPropertyValue('dtstamp')).toBeTruthy();

    const mine = await coordinator.get(`/api/rosters/${rosterId}/roster.ics`).query({ personId: people[1].id });
    const myEvents = new ICAL.Component(ICAL.parse(mine.text)).getAllSubcomponents('vevent');
    expect(myEvents).toHaveLength(3);
    expect(new ICAL.Event(myEvents[0]).summary).toBe('Day shift');

    const csv = await coordinator.get(`/api/rosters/${rosterId}/roster.csv`);
    expect(csv.status).toBe(200);
    const rows = csv.text.trim().split('\r\n');
    expect(rows[0]).toBe('date,start,end,shift,person,time zone');
    expect(rows).toHaveLength(1 + 6);
    expect(rows).toContain('2027-07-06,08:00,16:00,day,Bram Ellery,Europe/London');
    // The name holds a comma, so it is quoted (RFC 4180 §2.6).
    expect(rows).toContain('2027-07-05,08:00,16:00,day,"Aurélie Wintersgill-Featherstonehaugh of the Upper Ward, Night Team",Europe/London');

    expect((await coordinator.get(`/api/rosters/${rosterId}/roster.ics`).query({ personId: 999999 })).status).toBe(404);
    expect((await coordinator.get(`/api/rosters/${rosterId}/roster.csv`).query({ runId: 'x' })).status).toBe(400);
  });

  it('reopens with a version check, and an unpublished roster without a run to export says so', async () => {
    const roster = (await coordinator.get(`/api/rosters/${rosterId}`)).body;
    expect((await coordinator.post(`/api/rosters/${rosterId}/reopen`).send({ version: roster.version - 1 })).status).toBe(409);
    const reopened = await coordinator.post(`/api/rosters/${rosterId}/reopen`).send({ version: roster.version });
    expect(reopened.status).toBe(200);
    expect(reopened.body.status).toBe('solved');
    expect((await coordinator.post(`/api/rosters/${rosterId}/reopen`).send({ version: reopened.body.version })).status).toBe(409);

    // Re-publishing after a reopen tells only the people whose shifts changed, and what changed.
    const published = (await coordinator.get(`/api/runs/${runId}`)).body.assignments as Array<{ seatId: number; personId: number | null }>;
    const theirs = published.find((x) => x.personId === people[0].id)!;
    const edited = Object.fromEntries(published.map((x) => [String(x.seatId), x.seatId === theirs.seatId ? null : x.personId]));
    const manual = await coordinator.post(`/api/rosters/${rosterId}/manual-runs`).send({ assignment: edited, version: reopened.body.version, basedOnRunId: runId });
    expect(manual.status).toBe(201);
    const current = (await coordinator.get(`/api/rosters/${rosterId}`)).body;
    const before = mailer.outbox.length;
    const again = await coordinator.post(`/api/rosters/${rosterId}/publish`).send({ runId: manual.body.runId, version: current.version });
    expect(again.status).toBe(200);
    expect(again.body.mail.sent.map((m: { to: string }) => m.to)).toEqual(['aurelie@example.test']);
    const notice = mailer.outbox.slice(before);
    expect(notice).toHaveLength(1);
    expect(notice[0].text).toMatch(/no longer/i);

    const fresh = await coordinator.post('/api/rosters').send({ name: 'Empty', periodStart: '2027-08-02', periodEnd: '2027-08-08', timeZone: 'Europe/London' });
    expect(fresh.status, JSON.stringify(fresh.body)).toBe(201);
    const res = await coordinator.get(`/api/rosters/${fresh.body.id}/roster.ics`);
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/not published yet/);
  });
});
