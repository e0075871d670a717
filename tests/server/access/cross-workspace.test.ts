import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import { routeTable, type RouteSpec } from '../../../server/http/routes';
import { Membership, type Role } from '../../../server/db/models';
import { RowMaker, tableFor } from './route-fixtures';

/**
 * Valid bodies for routes that validate their body before looking the id up, so the 404 really
 * comes from the workspace scope. A route missing here that answers 400 about its body fails the
 * test: its scope would be unproven.
 */
const bodies: Record<string, unknown> = {
  'patch /api/members/:id': { role: 'staff' },
  'put /api/members/:id/person': { personId: null },
  // Bodies from the shared schemas of the other resources (shared/api/*.ts).
  'patch /api/skills/:id': { name: 'Renamed skill' },
  'patch /api/people/:id': { name: 'Renamed person', version: 1 },
  'patch /api/rosters/:rosterId': { name: 'Renamed roster', version: 1 },
  'patch /api/rosters/:rosterId/shifts/:id': { label: 'Renamed shift', version: 1 },
  'patch /api/pairings/:id': { score: 5, version: 1 },
  'post /api/rosters/:rosterId/publish': { runId: 1, version: 1 },
  'post /api/rosters/:rosterId/reopen': { version: 1 },
  'put /api/rosters/:rosterId/rules': { rules: {}, version: 1 },
  'post /api/rosters/:rosterId/patterns/preview': { label: 'Early', weekdays: ['mon'], startTime: '07:00', endTime: '15:00', seats: [{ count: 1 }] },
  'post /api/rosters/:rosterId/patterns': { label: 'Early', weekdays: ['mon'], startTime: '07:00', endTime: '15:00', seats: [{ count: 1 }] },
  'post /api/rosters/:rosterId/shifts': { label: 'Extra', startsLocal: '2027-01-04T07:00', endsLocal: '2027-01-04T15:00', seats: [{ skillId: null }] },
  'post /api/rosters/:rosterId/wishes': { personId: 1, date: '2027-01-04', kind: 'avoid' },
  'put /api/rosters/:rosterId/pins': { seatId: 1, personId: null },
  'post /api/rosters/:rosterId/score': { assignment: {} },
  'post /api/rosters/:rosterId/manual-runs': { assignment: {}, version: 1 },
  'post /api/runs/:id/concession-price': { index: 0 },
  'post /api/rosters/:rosterId/preferences/alternative': { runId: 1, seatId: 1, personId: null },
  'post /api/me/rosters/:rosterId/wishes': { date: '2027-01-04', kind: 'avoid' },
  'post /api/me/rosters/:rosterId/wishes/weekly': { weekday: 'tue', kind: 'cannot' },
  'patch /api/absences/:id': { note: 'Moved', version: 1 },
  'post /api/absences/:id/decision': { decision: 'approve', version: 1 },
  'post /api/people/:id/restore': { version: 1 },
  'post /api/people/:id/terms': { term: { kind: 'noNights' }, effectiveFrom: '2027-01-01' },
  'patch /api/people/:id/terms/:termId': { effectiveFrom: '2027-01-02', version: 1 },
  'patch /api/rosters/:rosterId/wishes/:id': { kind: 'avoid' },
  'post /api/rosters/:rosterId/suggestion/adopt': { suggestionId: 1 },
  'post /api/rosters/:rosterId/suggestion/dismiss': { suggestionId: 1 },
  'post /api/rosters/:rosterId/copy-forward': { name: 'Copied roster', periodStart: '2027-02-01' },
  'post /api/me/swaps/:id/accept': { version: 1 },
  'post /api/me/swaps/:id/decline': { version: 1 },
  'post /api/me/swaps/:id/withdraw': { version: 1 },
  'post /api/swaps/:id/decision': { decision: 'refuse', version: 1 },
  'post /api/rosters/:rosterId/offers': { seatId: 1 },
  'post /api/offers/:id/decision': { decision: 'refuse', version: 1 },
  'post /api/offers/:id/withdraw': { version: 1 },
};

/** Queries a GET route validates before it looks up the roster (a valid one, so the scope is what answers). */
const queries: Record<string, string> = {
  'get /api/rosters/:rosterId/publish-preview': 'runId=1',
  'get /api/rosters/:rosterId/compare': 'a=1&b=2',
};

/**
 * For every `/api` route with an id in its path: rows made in workspace B, asked for by a member of
 * workspace A with a role the route allows. Every answer must be 404, no write may land, and no
 * value of B's rows may appear in any answer.
 */
describe('cross-workspace: ids of another workspace are 404 on every route', () => {
  let db: TestDb;
  let app: ReturnType<typeof makeApp>['app'];
  let maker: RowMaker;
  let tables: string[];
  const withParams: RouteSpec[] = [];
  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app; // mounts every router, filling routeTable
    maker = new RowMaker(db.sequelize, db.env.db.database);
    tables = await maker.tables();
    withParams.push(...routeTable.filter((r) => r.path.includes('/:') && r.access !== 'public'));
  });
  afterAll(async () => {
    await db.drop();
  });

  it('knows a table for every id in every route path', () => {
    const unknown = withParams.flatMap((r) => {
      const segs = r.path.split('/');
      return segs.flatMap((s, i) => (s.startsWith(':') && segs[i - 1] !== 'members' && !tableFor(segs[i - 1], tables) ? [`${r.method} ${r.path} (${s})`] : []));
    });
    expect(unknown).toEqual([]);
  });

  it('answers 404 for B ids to a member of A, for every route and id', async () => {
    expect(withParams.length).toBeGreaterThan(0);
    const a = await makeWorkspace('Workspace A');
    const b = await makeWorkspace('Workspace B');
    const agents = new Map<Role, Awaited<ReturnType<typeof signedIn>>['agent']>();
    const agentFor = async (role: Role) => {
      if (!agents.has(role)) agents.set(role, (await signedIn(app, a, role)).agent);
      return agents.get(role)!;
    };
    const failures: string[] = [];
    const unproven: string[] = [];
    for (const route of withParams) {
      const role: Role = route.access === 'signed-in' || route.access === 'public' || route.access.includes('admin') ? 'admin' : route.access[0];
      // Make B's rows along the path, each child pointing at the parents made before it.
      const segs = route.path.split('/');
      const made: Array<{ table: string; id: number }> = [];
      let url = '';
      for (let i = 1; i < segs.length; i++) {
        const seg = segs[i];
        if (!seg.startsWith(':')) {
          url += `/${seg}`;
          continue;
        }
        let id: number;
        let table: string;
        if (segs[i - 1] === 'members') {
          // A member id is a user id; the user belongs to B only.
          table = 'users';
          id = await maker.make('users', b.id);
          await Membership.create({ workspaceId: b.id, userId: id, role: 'staff' });
        } else {
          table = tableFor(segs[i - 1], tables)!;
          const fixed: Record<string, unknown> = {};
          for (const fk of await maker.foreignKeys(table)) {
            const parent = made.find((m) => m.table === fk.table);
            if (parent) fixed[fk.column] = parent.id;
          }
          id = await maker.make(table, b.id, fixed);
        }
        made.push({ table, id });
        url += `/${id}`;
      }
      const agent = await agentFor(role);
      const key = `${route.method} ${route.path}`;
      const req = agent[route.method](queries[key] ? `${url}?${queries[key]}` : url);
      const res = route.method === 'get' || route.method === 'delete' ? await req : await req.send((bodies[key] as object) ?? {});
      const text = JSON.stringify(res.body ?? '') + (res.text ?? '');
      const leaked = maker.markers.find((m) => text.includes(m));
      if (leaked) failures.push(`${key}: answer contains B's value ${leaked}`);
      if (res.status === 404) {
        // ok
      } else if (res.status === 400 && !bodies[key] && (res.body?.error?.fields ?? []).every((f: { path: string }) => f.path.startsWith('body'))) {
        unproven.push(key);
      } else {
        failures.push(`${key} as ${role}: ${res.status} ${JSON.stringify(res.body).slice(0, 160)}`);
      }
      const last = made[made.length - 1];
      if (route.method === 'delete' && last.table !== 'users' && !(await maker.exists(last.table, last.id))) failures.push(`${key}: deleted B's row`);
    }
    // A new route that validates its body first needs a valid body above, or its scope is unproven.
    expect(unproven).toEqual([]);
    expect(failures).toEqual([]);
    expect(await Membership.count({ where: { workspaceId: b.id } })).toBeGreaterThan(0);
  });
});
