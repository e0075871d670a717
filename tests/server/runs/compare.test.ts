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
    // Per-person terms (soft, so both fillings can be saved): D off on Wednesdays, B at most 3
    // shifts a week, C at most 4 h, and a hard no-nights for A that no filling breaks.
    const terms: Array<[number, Record<string, unknown>]> = [
      [3, { kind: 'daysOff', weekdays: ['wed'], hard: false, weight: 4 }],
      [1, { kind: 'maxShiftsPerWeek', count: 3, hard: false, weight: 2 }],
      [2, { kind: 'maxHours', hours: 4, hard: false, weight: 1 }],
      [0, { kind: 'noNights', hard: true }],
    ];
    for (const [i, term] of terms) expect((await coordinator.post(`/api/people/${people[i].id}/terms`).send({ term, effectiveFrom: '2027-01-01' })).status).toBe(201);
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
    // Per person: the penalties naming them, summed per term, B − A; their wishes in closed form
    // (a kept prefer wish scores its strength, a kept avoid wish costs it; the roster has no pairings).
    const perPerson = (sc: typeof sa, fill: Record<string, string | null>) => {
      const m = new Map<string, number>();
      for (const v of sc.violations.filter((x) => !x.hard && x.term !== 'wishes')) for (const p of v.people) m.set(`${p}|${v.term}`, (m.get(`${p}|${v.term}`) ?? 0) + v.points);
      for (const w of parsed.roster.wishes) {
        const works = parsed.roster.seats.some((s) => fill[s.id] === w.person && parsed.roster.shifts.find((x) => x.id === s.shift)!.start.startsWith(w.date ?? '-'));
        const points = works ? (w.kind === 'prefer' ? w.strength : w.kind === 'avoid' ? -w.strength : 0) : 0;
        m.set(`${w.person}|wishes`, (m.get(`${w.person}|wishes`) ?? 0) + points);
      }
      return m;
    };
    expect(parsed.roster.pairings).toEqual([]);
    const pa = perPerson(sa, fillOf(rowsA));
    const pb = perPerson(sb, fillOf(rowsB));
    const want = [...new Set([...pa.keys(), ...pb.keys()])].map((k) => [k, (pb.get(k) ?? 0) - (pa.get(k) ?? 0)] as const).filter(([, d]) => Math.abs(d) > 1e-9);
    expect(res.body.personTerms.map((t: { id: number; term: string }) => `p${t.id}|${t.term}`).sort()).toEqual(want.map(([k]) => k).sort());
    for (const t of res.body.personTerms) expect(t.change).toBeCloseTo(want.find(([k]) => k === `p${t.id}|${t.term}`)![1], 6);
    // D works Wednesday in B: closer to a 30 h week (contracted hours, ± 8 h tolerance), and the prefer wish is kept (a gain, not a penalty).
    expect(res.body.personTerms.find((t: { id: number; term: string }) => t.id === people[3].id && t.term === 'contractedHours').change).toBeGreaterThan(0);
    expect(res.body.personTerms.find((t: { id: number; term: string }) => t.id === people[3].id && t.term === 'wishes').change).toBeGreaterThan(0);
    const key = (v: { term: string; message: string }) => `${v.term}|${v.message}`;
    const softA = new Set(sa.violations.filter((v) => !v.hard).map(key));
    const softB = new Set(sb.violations.filter((v) => !v.hard).map(key));
    expect(res.body.concessionsAdded.map(key).sort()).toEqual([...softB].filter((k) => !softA.has(k)).sort());
    expect(res.body.concessionsRemoved.map(key).sort()).toEqual([...softA].filter((k) => !softB.has(k)).sort());
    expect(res.body.concessionsRemoved.length + res.body.concessionsAdded.length).toBeGreaterThan(0);
  });

  it('shows every per-person term in both runs, honoured or not, with points that add up to scoreRoster\'s terms', async () => {
    const res = await coordinator.get(`/api/rosters/${rosterId}/compare`).query({ a: runA, b: runB });
    expect(res.status).toBe(200);
    const { parsed } = await assembleRoster(workspace.id, rosterId);
    if (!parsed.ok) throw new Error('roster does not parse');
    const fillOf = async (runId: number) => Object.fromEntries((await AssignmentRow.findAll({ where: { runId } })).map((r) => [`st${r.seatId}`, r.personId ? `p${r.personId}` : null]));
    type Outcome = { honoured: boolean; units: number; points: number | null };
    type Row = { id: number; kind: string; hard: boolean; words: string; a: Outcome; b: Outcome; change: number | null };
    const rows = res.body.personRuleTerms as Row[];
    expect(rows).toHaveLength(4);
    for (const [side, runId] of [['a', runA], ['b', runB]] as const) {
      const score = scoreRoster(parsed.roster, await fillOf(runId));
      for (const kind of ['daysOff', 'maxShiftsPerWeek', 'maxHours', 'noNights']) {
        const mine = rows.filter((r) => r.kind === kind);
        // Soft: the points per kind add up to scoreRoster's term; hard: the breaks to its hard count.
        expect(mine.reduce((m, r) => m + (r[side].points ?? 0), 0)).toBeCloseTo((score.terms as Record<string, number>)[kind], 6);
        expect(mine.filter((r) => r.hard).reduce((m, r) => m + r[side].units, 0)).toBe((score.hardCounts as Record<string, number>)[kind]);
        // Honoured exactly when scoreRoster names that person under that term nowhere.
        for (const r of mine) expect(r[side].honoured).toBe(!score.violations.some((v) => v.term === kind && v.people.includes(`p${r.id}`)));
      }
    }
    // Closed forms: the fillings put A and B on every early seat 0 and 1 (Mon–Fri), except that B
    // (the run) has C and D on Wednesday; each shift is 8 h.
    const row = (person: number, kind: string) => rows.find((r) => r.id === people[person].id && r.kind === kind)!;
    expect(row(3, 'daysOff')).toMatchObject({ words: 'Always off on Wed (soft, 4 points a shift)', a: { honoured: true, units: 0, points: 0 }, b: { honoured: false, units: 1, points: -4 }, change: -4 });
    expect(row(1, 'maxShiftsPerWeek')).toMatchObject({ a: { honoured: false, units: 2, points: -4 }, b: { honoured: false, units: 1, points: -2 }, change: 2 });
    expect(row(2, 'maxHours')).toMatchObject({ a: { honoured: true, points: 0 }, b: { honoured: false, units: 4, points: -4 }, change: -4 });
    expect(row(0, 'noNights')).toMatchObject({ hard: true, a: { honoured: true, units: 0, points: null }, b: { honoured: true, units: 0, points: null }, change: null });
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
