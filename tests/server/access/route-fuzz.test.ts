import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { PASSWORD, agent, makeApp, makePerson, makeUser, makeWorkspace } from '../auth/helpers';
import { makeApiRoster } from '../rosters/fixtures';
import { seatsOf } from '../staff/publish-helper';
import { routeTable, type RouteSpec } from '../../../server/http/routes';
import type { Role } from '../../../server/db/models';
import { AssignmentRow, Roster, RunRow } from '../../../server/rosters/models';

/**
 * Property-based route fuzz (fast-check, https://fast-check.dev): every route in routeTable gets
 * generated bad params, queries and bodies, as each role and signed out. The property: the API
 * never answers 5xx, and every error answer is `{ error: { code, message, fields? } }` (the house
 * error shape, server/http/errors.ts) and nothing else. Seeded and bounded per route, so a
 * failure replays with the same seed and the file stays within a minute or two.
 */

type Who = 'signed out' | Role;
const IDENTITIES: Who[] = ['signed out', 'admin', 'coordinator', 'staff'];
const SEED = Number(process.env.ROTALOOM_FUZZ_SEED ?? 20270301);
/** Cases per route for an identity the route admits; the guard answers the others, so a few suffice. */
const RUNS_ADMITTED = Number(process.env.ROTALOOM_FUZZ_RUNS ?? 16);
const RUNS_REFUSED = 2;
const ANSWER_WITHIN_MS = 10_000;

/**
 * Deliberate non-JSON error answers: the private calendar feed answers an empty 404 for any
 * unknown token, so a calendar program (not our client) learns nothing (tests/server/staff/feed.test.ts).
 */
const EMPTY_ERROR_OK = new Set(['get /api/feeds/:token.ics']);
/** Routes whose success is a server-sent event stream that stays open (RFC 8895 text/event-stream): judged by status and headers. */
const STREAMS = new Set(['get /api/runs/:id/events']);
/** Reads a stream's first chunk and stops; other answers whole, JSON parsed when they are JSON. */
const firstChunkOrWhole = (res: NodeJS.ReadableStream & { headers: Record<string, string> }, done: (err: Error | null, body: unknown) => void) => {
  let text = '';
  const stream = /text\/event-stream/.test(res.headers['content-type'] ?? '');
  res.setEncoding('utf8');
  res.on('data', (chunk: string) => {
    text += chunk;
    if (stream) {
      (res as unknown as { destroy(): void }).destroy();
      done(null, { stream: text });
    }
  });
  res.on('end', () => {
    if (stream) return;
    try {
      done(null, text ? JSON.parse(text) : {});
    } catch {
      done(null, text);
    }
  });
};

const admits = (route: RouteSpec, who: Who) => route.access === 'public' || (who !== 'signed out' && (route.access === 'signed-in' || route.access.includes(who)));

/** What an error answer must look like; anything else (HTML, a stack, extra top-level keys) is a finding. */
function errorShapeProblem(body: unknown): string | null {
  if (typeof body !== 'object' || body === null || Array.isArray(body)) return 'not a JSON object';
  const keys = Object.keys(body);
  if (keys.length !== 1 || keys[0] !== 'error') return `top-level keys ${JSON.stringify(keys)}`;
  const e = (body as { error: Record<string, unknown> }).error;
  if (typeof e !== 'object' || e === null) return 'error is not an object';
  if (typeof e.code !== 'string' || !e.code) return 'no error.code';
  if (typeof e.message !== 'string' || !e.message) return 'no error.message';
  if (e.fields !== undefined) {
    if (!Array.isArray(e.fields)) return 'fields is not an array';
    for (const f of e.fields) if (typeof f?.path !== 'string' || typeof f?.message !== 'string') return `bad field ${JSON.stringify(f)}`;
  }
  return null;
}

describe('route fuzz: no 5xx and only the JSON error shape, for every route, role and generated input', () => {
  let db: TestDb;
  let app: Express;
  const ids: Record<string, number[]> = {};

  beforeAll(async () => {
    // The fuzz signs in with wrong passwords by the hundred; the per-address limit is for other tests.
    db = await createTestDb({ ROTALOOM_SIGNIN_MAX_PER_ADDRESS: '1000000', ROTALOOM_SIGNIN_MAX_PER_ACCOUNT: '1000000' });
    app = makeApp(db).app;
  });
  afterAll(async () => {
    await db?.drop();
  });

  it('holds for every route in routeTable', async () => {
    const workspace = await makeWorkspace('Fuzz House');
    const identities = new Map<Who, ReturnType<typeof agent>>();
    /** A fresh user of this role, signed in (a fuzzed request may have signed out, demoted or removed the last one). */
    const identify = async (who: Who) => {
      const a = agent(app);
      if (who !== 'signed out') {
        const user = await makeUser({ workspace, role: who });
        if (who === 'staff') await makePerson(workspace, { name: 'Fuzz Staff', userId: user.id });
        const res = await a.post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD });
        if (res.status !== 200) throw new Error(`sign-in as ${who}: ${res.status} ${JSON.stringify(res.body)}`);
      }
      identities.set(who, a);
    };
    for (const who of IDENTITIES) await identify(who);
    const stillWho = async (who: Who) => {
      const s = (await identities.get(who)!.get('/api/auth/session')).body;
      return who === 'signed out' ? s?.user == null : s?.user != null && s.role === who && s.workspace?.id === workspace.id;
    };

    // Real ids, so generated requests also get past "not found" into the handlers.
    const coordinator = identities.get('coordinator')!;
    const fixture = await makeApiRoster(coordinator, workspace, { people: 4 });
    const seats = await seatsOf(workspace.id, fixture.roster.id);
    const roster = (await Roster.findByPk(fixture.roster.id))!;
    const run = await RunRow.create({ workspaceId: workspace.id, rosterId: roster.id, status: 'done', parameters: { timeLimitSeconds: 1, seed: 1 }, rosterVersion: roster.version, result: { feasible: true } as object, finishedAt: new Date() });
    await AssignmentRow.bulkCreate(seats.map((s, i) => ({ workspaceId: workspace.id, runId: run.id, seatId: s.seatId, personId: fixture.people[i % 2].id, pinned: false })));
    ids.rosterId = [fixture.roster.id];
    ids.runId = [run.id];
    ids.personId = fixture.people.map((p) => p.id);
    ids.seatId = seats.slice(0, 3).map((s) => s.seatId);
    ids.shiftId = [...new Set(seats.map((s) => s.shiftId))].slice(0, 2);
    ids.skillId = [fixture.firstAid.id];
    const allIds = [...new Set(Object.values(ids).flat())];

    // ---- generators ----
    const weirdText = fc.constantFrom(
      '', ' ', 'abc', '0', '-1', '1.5', '1e309', 'NaN', 'null', 'true', '[]', '{}', '9999999999999999999999', '4000000001', '0x1f',
      '2031-02-30', '2027-13-01', '2027-00-10', '0000-01-01', '9999-12-31', '2027-03-01T25:61', '2027-03-01T07:00', '24:00', '07:60', '2027-02-29',
      'Mars/Olympus', 'Europe/London', 'UTC', 'a\rb', 'a\u0000b', 'x'.repeat(5000), '\u{1F600}'.repeat(40), '%', '\\', "'; DROP TABLE people; --",
      'mon', 'fri', 'prefer', 'cannot', 'admin', 'staff', 'hard', 'soft', 'approved', 'nobody@example.test', '../../etc/passwd',
    );
    const someText = fc.oneof(weirdText, fc.string({ maxLength: 30 }), fc.string({ unit: 'binary', maxLength: 20 }));
    const someNumber = fc.oneof(
      fc.constantFrom(0, -1, 1, 2, 3, 1.5, 1e308, -1e308, 2 ** 31, 2 ** 32, 2 ** 53, Number.MAX_SAFE_INTEGER + 2, 1e-9, 168, 169, 366, 367),
      fc.constantFrom(...allIds),
      fc.integer(),
      fc.double({ noNaN: true }),
    );
    const leaf = fc.oneof(someText, someNumber, fc.boolean(), fc.constant(null));
    const FIELDS = [
      'name', 'email', 'password', 'newPassword', 'currentPassword', 'displayName', 'token', 'role', 'version', 'id',
      'periodStart', 'periodEnd', 'timeZone', 'wishDeadline', 'maxCannotDays', 'label', 'weekdays', 'startTime', 'endTime', 'seats', 'skillId', 'count',
      'startsLocal', 'endsLocal', 'night', 'personId', 'personAId', 'personBId', 'colleagueId', 'seatId', 'shiftId', 'runId', 'date', 'kind', 'strength',
      'note', 'reason', 'score', 'neverTogether', 'together', 'status', 'rules', 'skillIds', 'contractedHours', 'timeLimitSeconds', 'seed', 'assignments',
      'workspaceId', 'userId', 'plan', 'quantity', 'start', 'end', 'credits', 'term', 'effectiveFrom', 'startDate', 'endDate', 'archive', 'archived',
      'page', 'pageSize', 'sort', 'order', 'q', 'returnTo', 'concession', 'confirm', 'message', 'enabled', 'hard', 'weight', 'hours', 'days',
    ];
    const key = fc.oneof({ weight: 4, arbitrary: fc.constantFrom(...FIELDS) }, { weight: 1, arbitrary: fc.constantFrom('__proto__', 'constructor', '', 'a.b', 'x'.repeat(300)) });
    const value = fc.letrec((tie) => ({
      v: fc.oneof({ depthSize: 'small', maxDepth: 3 }, leaf, leaf, fc.array(tie('v'), { maxLength: 4 }), fc.dictionary(key, tie('v'), { maxKeys: 4 })),
    })).v;
    const body: fc.Arbitrary<{ json?: unknown; raw?: string }> = fc.oneof(
      { weight: 6, arbitrary: fc.dictionary(key, value, { maxKeys: 8 }).map((json) => ({ json })) },
      { weight: 1, arbitrary: fc.jsonValue({ maxDepth: 3 }).map((json) => ({ json })) },
      { weight: 1, arbitrary: fc.constantFrom('{"name":', '[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]', 'null', '"x"', '{"a":1}x', `{"name":"${'z'.repeat(200_000)}"}`).map((raw) => ({ raw })) },
    );
    const param = fc.oneof(
      { weight: 3, arbitrary: fc.constantFrom(...allIds).map(String) },
      { weight: 2, arbitrary: weirdText.map((t) => encodeURIComponent(t.slice(0, 300))) },
      { weight: 1, arbitrary: fc.constantFrom('%E0%A4%A', '%00', '..', '1%2F2') },
    );
    const query = fc.dictionary(key, fc.oneof(someText, someNumber.map(String), fc.array(someText, { maxLength: 3 })), { maxKeys: 4 });
    // Valid bodies for the routes that take the richest input; the fuzz breaks one field at a time
    // (replaced, dropped or added), so most cases get past validation of the rest into the handler.
    const [p0, p1] = ids.personId;
    const EXAMPLES: Record<string, Record<string, unknown>> = {
      'post /api/rosters': { name: 'R', periodStart: '2027-04-01', periodEnd: '2027-04-07', timeZone: 'Europe/London' },
      'patch /api/rosters/:rosterId': { version: 1, periodStart: '2027-03-01', periodEnd: '2027-03-07', name: 'R2' },
      'post /api/rosters/:rosterId/patterns': { label: 'late', weekdays: ['mon'], startTime: '15:00', endTime: '23:00', seats: [{ skillId: null, count: 1 }] },
      'post /api/rosters/:rosterId/patterns/preview': { label: 'late', weekdays: ['mon'], startTime: '15:00', endTime: '23:00', seats: [{ skillId: null, count: 1 }] },
      'post /api/rosters/:rosterId/shifts': { label: 'x', startsLocal: '2027-03-02T07:00', endsLocal: '2027-03-02T15:00', seats: [{ skillId: null }] },
      'patch /api/rosters/:rosterId/shifts/:id': { version: 1, startsLocal: '2027-03-02T07:00', endsLocal: '2027-03-02T15:00' },
      'post /api/rosters/:rosterId/wishes': { personId: p0, date: '2027-03-02', kind: 'prefer', strength: 5 },
      'put /api/rosters/:rosterId/pins': { seatId: ids.seatId[0], personId: p0 },
      'put /api/rosters/:rosterId/rules': { version: 1, rules: {} },
      'post /api/rosters/:rosterId/runs': { timeLimitSeconds: 1, seed: 1 },
      'post /api/rosters/:rosterId/manual-runs': { assignments: [{ seatId: ids.seatId[0], personId: p0 }] },
      'post /api/rosters/:rosterId/publish': { runId: ids.runId[0], version: 1 },
      'post /api/pairings': { personAId: p0, personBId: p1, score: 3, neverTogether: false },
      'post /api/people': { name: 'N', contractedHours: 10, skillIds: [] },
      'patch /api/people/:id': { version: 1, name: 'N2', skillIds: ids.skillId },
      'post /api/people/:id/terms': { term: { kind: 'no-nights' }, effectiveFrom: '2027-03-01' },
      'post /api/me/rosters/:rosterId/wishes': { date: '2027-03-02', kind: 'avoid' },
      'post /api/me/pairings': { colleagueId: p0, together: true, reason: 'r' },
      'post /api/absences': { personId: p0, kind: 'annual', startDate: '2027-03-02', endDate: '2027-03-03' },
      'post /api/me/absences': { kind: 'annual', startDate: '2027-03-02', endDate: '2027-03-03' },
      'post /api/invitations': { email: 'new@example.test', role: 'staff' },
      'post /api/auth/sign-up': { email: 'n@example.test', password: 'a long enough password', displayName: 'N' },
      'post /api/auth/sign-up/finish': { token: 'x'.repeat(43), password: 'a long enough password' },
      'post /api/workspaces': { name: 'W', timeZone: 'Europe/London' },
    };
    type Body = { json?: unknown; raw?: string };
    const mutated = (example: Record<string, unknown>): fc.Arbitrary<Body> =>
      fc.oneof(
        // Mostly the hand-picked bad strings (impossible dates, unknown zones, control characters).
        fc.record({ k: fc.constantFrom(...Object.keys(example)), v: fc.oneof({ weight: 3, arbitrary: weirdText }, { weight: 2, arbitrary: value }) }).map(({ k, v }): Body => ({ json: { ...example, [k]: v } })),
        fc.constantFrom(...Object.keys(example)).map((k): Body => ({ json: Object.fromEntries(Object.entries(example).filter(([key]) => key !== k)) })),
        fc.record({ k: key, v: value }).map(({ k, v }): Body => ({ json: { ...example, [k]: v } })),
      );
    const bodyFor = (route: RouteSpec): fc.Arbitrary<Body> => {
      const example = EXAMPLES[`${route.method} ${route.path}`];
      return example ? fc.oneof({ weight: 3, arbitrary: mutated(example) }, { weight: 1, arbitrary: body }) : body;
    };
    const request = (route: RouteSpec) =>
      fc.record({ params: fc.array(param, { minLength: 4, maxLength: 4 }), query, body: bodyFor(route), asForm: fc.integer({ min: 0, max: 9 }).map((n) => n === 0) }).map((r) => {
        let n = 0;
        return { ...r, url: route.path.replace(/:[A-Za-z]+/g, () => r.params[n++]) };
      });

    // ---- the walk ----
    const findings: string[] = [];
    // Routes that end sessions or remove things go last, so the rest still meet real rows.
    const rank = (r: RouteSpec) => (r.path === '/api/auth/sign-out' ? 3 : r.method === 'delete' ? 2 : r.path.includes('workspace') || r.path.includes('members') ? 1 : 0);
    const only = process.env.ROTALOOM_FUZZ_ONLY;
    const routes = [...routeTable].filter((r) => !only || r.path.includes(only)).sort((a, b) => rank(a) - rank(b));
    if (!only) expect(routes.length).toBeGreaterThan(50);
    let requests = 0;
    for (const route of routes) {
      for (const who of IDENTITIES) {
        const runs = admits(route, who) ? RUNS_ADMITTED : RUNS_REFUSED;
        await fc.assert(
          fc.asyncProperty(request(route), async (r) => {
            const a = identities.get(who)!;
            let req = a[route.method](r.url).query(r.query as Record<string, string>);
            if (route.method !== 'get' && route.method !== 'delete') {
              const json = r.body.json;
              if (r.body.raw !== undefined) req = req.set('Content-Type', 'application/json').send(r.body.raw);
              else if (r.asForm && json && typeof json === 'object' && !Array.isArray(json)) req = req.type('form').send(JSON.parse(JSON.stringify(json)));
              else req = req.set('Content-Type', 'application/json').send(JSON.stringify(json ?? null));
            }
            // A request that never answers is a finding too (a dependency that stalls must time out), not a hung test.
            if (STREAMS.has(`${route.method} ${route.path}`)) req = req.buffer(true).parse(firstChunkOrWhole as never);
            const res = await req.ok(() => true).timeout(ANSWER_WITHIN_MS).catch((err: { timeout?: number }) => {
              if (err?.timeout === undefined) throw err;
              return null;
            });
            requests++;
            if (res === null) {
              findings.push(`${route.method.toUpperCase()} ${r.url} as ${who}: no answer within ${ANSWER_WITHIN_MS} ms`);
              return true;
            }
            const where = `${route.method.toUpperCase()} ${r.url}${Object.keys(r.query).length ? `?${new URLSearchParams(r.query as Record<string, string>)}` : ''} as ${who}`;
            // A 503 says a dependency is down (the solve queue, when no Redis runs here), in the error shape, with Retry-After.
            const unavailable = res.status === 503 && errorShapeProblem(res.body) === null && res.headers['retry-after'] !== undefined;
            if (res.status >= 500 && !unavailable) findings.push(`${where}: ${res.status} ${JSON.stringify(res.body).slice(0, 200)} (body ${JSON.stringify(r.body).slice(0, 200)})`);
            else if (res.status >= 400 && !(EMPTY_ERROR_OK.has(`${route.method} ${route.path}`) && res.text === '')) {
              const problem = errorShapeProblem(res.body);
              if (problem) findings.push(`${where}: ${res.status} with ${problem}: ${(res.text ?? '').slice(0, 120)}`);
            }
            return true;
          }),
          { seed: SEED + routes.indexOf(route) * 7 + IDENTITIES.indexOf(who), numRuns: runs, endOnFailure: true },
        );
        if (!(await stillWho(who))) await identify(who);
      }
    }
    console.log(`route fuzz: ${requests} requests over ${routes.length} routes, ${findings.length} findings`);
    expect([...new Set(findings)]).toEqual([]);
  }, 600_000);
});
