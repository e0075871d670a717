import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import { AssignmentRow } from '../../../server/rosters/models';
import type { Workspace } from '../../../server/db/models';
import { assembleRoster } from '../../../server/rosters/assemble';
import { scoreRoster } from '../../../solver/roster';
import { makeApiRoster } from '../rosters/fixtures';
import { seatsOf } from '../staff/publish-helper';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

describe('two runs of a roster side by side', () => {
  let db: TestDb;
  let app: Express;
  let coordinator: Agent;
  let rosterId: number;
  let runA: number;
  let runB: number;
  let people: Array<{ id: number; name: string }>;
  let workspace: Workspace;

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    workspace = await makeWorkspace('Willowmere House');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    const fixture = await makeApiRoster(coordinator, workspace, { people: 4 });
    rosterId = fixture.roster.id;
    people = fixture.people;
    // A prefer wish makes one filling score differently from the other.
    expect((await coordinator.post(`/api/rosters/${rosterId}/wishes`).send({ personId: people[3].id, date: '2027-03-03', kind: 'prefer' })).status).toBe(201);
    const seats = await seatsOf(workspace.id, rosterId);
    // Seat 0 of each early needs first aid (people 0 and 2 hold it); seat 1 is anyone's.
    const fill = (swapWed: boolean) =>
      Object.fromEntries(seats.map((s) => [String(s.seatId), s.position === 0 ? (s.startsLocal.slice(8, 10) === '03' && swapWed ? people[2].id : people[0].id) : s.startsLocal.slice(8, 10) === '03' && swapWed ? people[3].id : people[1].id]));
    let version = (await coordinator.get(`/api/rosters/${rosterId}`)).body.version;
    const save = async (assignment: Record<string, number>) => {
      const res = await coordinator.post(`/api/rosters/${rosterId}/manual-runs`).send({ assignment, version });
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      version = res.body.version;
      return res.body.runId as number;
    };
    runA = await save(fill(false));
    runB = await save(fill(true));
  });
  afterAll(async () => {
    await db.drop();
  });

  it('lists the changed seats, the people affected and the terms that moved, as the stored runs and scoreRoster have them', async () => {
    const res = await coordinator.get(`/api/rosters/${rosterId}/compare`).query({ a: runA, b: runB });
    expect(res.status).toBe(200);
    const rowsA = await AssignmentRow.findAll({ where: { runId: runA } });
    const rowsB = await AssignmentRow.findAll({ where: { runId: runB } });
    const heldB = new Map(rowsB.map((r) => [r.seatId, r.personId]));
    const changed = rowsA.filter((r) => heldB.get(r.seatId) !== r.personId);
    expect(changed).toHaveLength(2);
    expect(res.body.seats.map((s: { seatId: number }) => s.seatId).sort()).toEqual(changed.map((r) => r.seatId).sort());
    for (const s of res.body.seats) {
      expect(s.a?.id ?? null).toBe(rowsA.find((r) => r.seatId === s.seatId)!.personId);
      expect(s.b?.id ?? null).toBe(heldB.get(s.seatId));
    }
    const affected = new Set(changed.flatMap((r) => [r.personId, heldB.get(r.seatId)]));
    expect(res.body.people.map((p: { id: number }) => p.id).sort()).toEqual([...affected].sort());

    const { parsed } = await assembleRoster(workspace.id, rosterId);
    if (!parsed.ok) throw new Error('roster does not parse');
    const fillOf = (rows: AssignmentRow[]) => Object.fromEntries(rows.map((r) => [`st${r.seatId}`, r.personId ? `p${r.personId}` : null]));
    const sa = scoreRoster(parsed.roster, fillOf(rowsA));
    const sb = scoreRoster(parsed.roster, fillOf(rowsB));
    expect(res.body.a.score).toBeCloseTo(sa.softTotal, 6);
    expect(res.body.b.score).toBeCloseTo(sb.softTotal, 6);
    const moved = Object.keys(sb.terms).filter((t) => Math.abs((sb.terms as Record<string, number>)[t] - (sa.terms as Record<string, number>)[t]) > 1e-9);
    expect(res.body.terms.map((t: { term: string }) => t.term).sort()).toEqual(moved.sort());
    expect(moved).toContain('wishes'); // D's prefer wish for Wednesday is kept in B only
    // Per person: the penalties naming them, summed per term, B − A.
    const perPerson = (sc: typeof sa) => {
      const m = new Map<string, number>();
      for (const v of sc.violations.filter((x) => !x.hard)) for (const p of v.people) m.set(`${p}|${v.term}`, (m.get(`${p}|${v.term}`) ?? 0) + v.points);
      return m;
    };
    const pa = perPerson(sa);
    const pb = perPerson(sb);
    const want = [...new Set([...pa.keys(), ...pb.keys()])].map((k) => [k, (pb.get(k) ?? 0) - (pa.get(k) ?? 0)] as const).filter(([, d]) => Math.abs(d) > 1e-9);
    expect(res.body.personTerms.map((t: { id: number; term: string }) => `p${t.id}|${t.term}`).sort()).toEqual(want.map(([k]) => k).sort());
    for (const t of res.body.personTerms) expect(t.change).toBeCloseTo(want.find(([k]) => k === `p${t.id}|${t.term}`)![1], 6);
    // D works Wednesday in B: closer to a 30 h week (contracted hours, ± 8 h tolerance).
    expect(res.body.personTerms.find((t: { id: number; term: string }) => t.id === people[3].id && t.term === 'contractedHours').change).toBeGreaterThan(0);
    const key = (v: { term: string; message: string }) => `${v.term}|${v.message}`;
    const softA = new Set(sa.violations.filter((v) => !v.hard).map(key));
    const softB = new Set(sb.violations.filter((v) => !v.hard).map(key));
    expect(res.body.concessionsAdded.map(key).sort()).toEqual([...softB].filter((k) => !softA.has(k)).sort());
    expect(res.body.concessionsRemoved.map(key).sort()).toEqual([...softA].filter((k) => !softB.has(k)).sort());
    expect(res.body.concessionsRemoved.length + res.body.concessionsAdded.length).toBeGreaterThan(0);
  });

  it('answers bad input with a 4xx naming the field', async () => {
    const other = await makeApiRoster(coordinator, workspace, { people: 1 });
    const cases: Array<[Record<string, unknown>, number, string]> = [
      [{ b: runB }, 400, 'query.a'],
      [{ a: runA, b: runA }, 400, 'query.b'],
      [{ a: 'x', b: runB }, 400, 'query.a'],
      [{ a: runA, b: 999999 }, 404, 'query.b'],
    ];
    for (const [query, status, field] of cases) {
      const res = await coordinator.get(`/api/rosters/${rosterId}/compare`).query(query);
      expect(res.status, JSON.stringify(query)).toBe(status);
      expect(res.body.error.fields.map((f: { path: string }) => f.path)).toContain(field);
    }
    const wrongRoster = await coordinator.get(`/api/rosters/${other.roster.id}/compare`).query({ a: runA, b: runB });
    expect(wrongRoster.status).toBe(404);
    expect(wrongRoster.body.error.fields[0].path).toBe('query.a');
  });
});
