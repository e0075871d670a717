import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { PASSWORD, agent, makeApp, makeUser, makeWorkspace } from '../auth/helpers';
import { routeTable, type RouteSpec } from '../../../server/http/routes';
import type { Role } from '../../../server/db/models';
import { CSRF_EXEMPT_PATHS } from '../../../server/auth/csrf';

type Who = 'signed out' | Role;
const everyone: Who[] = ['signed out', 'admin', 'coordinator', 'staff'];

/**
 * What each role may do, written here by hand and not read from the routes' own declarations:
 * public (anyone, signed in or not), signed-in (any account, no workspace needed), admin,
 * coordinators (admin and coordinator) or members (admin, coordinator and staff). A route added
 * without a line here fails, so someone decides who may call it; the guard is then probed
 * against this table.
 */
const WHO_MAY = `
    # Signing in, up and out is open to anyone; changing one's own account needs a session but no workspace.
    GET     /api/auth/session                                          public
    GET     /api/auth/providers                                        public
    POST    /api/auth/sign-in                                          public
    POST    /api/auth/sign-up                                          public
    GET     /api/auth/sign-up/preview                                  public
    POST    /api/auth/sign-up/finish                                   public
    POST    /api/auth/sign-out                                         public
    POST    /api/auth/forgot-password                                  public
    POST    /api/auth/reset-password                                   public
    POST    /api/auth/confirm-email                                    public
    PATCH   /api/auth/profile                                          signed-in
    POST    /api/auth/change-password                                  signed-in
    POST    /api/auth/change-email                                     signed-in
    GET     /api/auth/google                                           public
    GET     /api/auth/google/callback                                  public
    # Anyone signed in may make a workspace or switch between their own; only an admin renames it.
    GET     /api/workspaces                                            signed-in
    POST    /api/workspaces                                            signed-in
    PUT     /api/workspaces/current                                    signed-in
    PATCH   /api/workspaces/current                                    admin
    # Members and invitations are the admin's; an invitation is read and accepted through its link, by anyone holding it.
    GET     /api/members                                               admin
    PATCH   /api/members/:id                                           admin
    DELETE  /api/members/:id                                           admin
    PUT     /api/members/:id/person                                    admin
    GET     /api/invitations                                           admin
    POST    /api/invitations                                           admin
    DELETE  /api/invitations/:id                                       admin
    GET     /api/invitations/preview                                   public
    POST    /api/invitations/accept                                    public
    # People, skills, terms, rosters, runs and pairings: coordinators and admins, never staff.
    GET     /api/skills                                                coordinators
    POST    /api/skills                                                coordinators
    PATCH   /api/skills/:id                                            coordinators
    DELETE  /api/skills/:id                                            coordinators
    GET     /api/people                                                coordinators
    POST    /api/people                                                coordinators
    GET     /api/people/export                                         coordinators
    POST    /api/people/import/preview                                 coordinators
    POST    /api/people/import/commit                                  coordinators
    GET     /api/people/:id                                            coordinators
    PATCH   /api/people/:id                                            coordinators
    DELETE  /api/people/:id                                            coordinators
    POST    /api/people/:id/restore                                    coordinators
    GET     /api/people/:id/terms                                      coordinators
    POST    /api/people/:id/terms                                      coordinators
    PATCH   /api/people/:id/terms/:termId                              coordinators
    DELETE  /api/people/:id/terms/:termId                              coordinators
    GET     /api/rosters                                               coordinators
    POST    /api/rosters                                               coordinators
    GET     /api/rosters/:rosterId                                     coordinators
    PATCH   /api/rosters/:rosterId                                     coordinators
    DELETE  /api/rosters/:rosterId                                     coordinators
    GET     /api/rosters/:rosterId/export                              coordinators
    GET     /api/rosters/:rosterId/rules                               coordinators
    PUT     /api/rosters/:rosterId/rules                               coordinators
    GET     /api/rosters/:rosterId/patterns                            coordinators
    POST    /api/rosters/:rosterId/patterns/preview                    coordinators
    POST    /api/rosters/:rosterId/patterns                            coordinators
    DELETE  /api/rosters/:rosterId/patterns/:id                        coordinators
    GET     /api/rosters/:rosterId/shifts                              coordinators
    POST    /api/rosters/:rosterId/shifts                              coordinators
    PATCH   /api/rosters/:rosterId/shifts/:id                          coordinators
    DELETE  /api/rosters/:rosterId/shifts/:id                          coordinators
    GET     /api/rosters/:rosterId/wishes                              coordinators
    POST    /api/rosters/:rosterId/wishes                              coordinators
    PATCH   /api/rosters/:rosterId/wishes/:id                          coordinators
    DELETE  /api/rosters/:rosterId/wishes/:id                          coordinators
    GET     /api/rosters/:rosterId/pins                                coordinators
    PUT     /api/rosters/:rosterId/pins                                coordinators
    DELETE  /api/rosters/:rosterId/pins/:id                            coordinators
    POST    /api/rosters/:rosterId/runs                                coordinators
    GET     /api/rosters/:rosterId/runs                                coordinators
    POST    /api/rosters/:rosterId/score                               coordinators
    POST    /api/rosters/:rosterId/manual-runs                         coordinators
    POST    /api/rosters/:rosterId/publish                             coordinators
    POST    /api/rosters/:rosterId/reopen                              coordinators
    GET     /api/rosters/:rosterId/roster.csv                          coordinators
    GET     /api/rosters/:rosterId/roster.ics                          coordinators
    POST    /api/rosters/:rosterId/absence-cover                       coordinators
    GET     /api/rosters/:rosterId/roster.pdf                          coordinators
    GET     /api/rosters/:rosterId/publish-preview                     coordinators
    POST    /api/rosters/:rosterId/copy-forward                        coordinators
    GET     /api/rosters/:rosterId/suggestion                          coordinators
    POST    /api/rosters/:rosterId/suggestion                          coordinators
    POST    /api/rosters/:rosterId/suggestion/adopt                    coordinators
    POST    /api/rosters/:rosterId/suggestion/dismiss                  coordinators
    POST    /api/rosters/:rosterId/preferences/alternative             coordinators
    GET     /api/rosters/:rosterId/open-seats                          coordinators
    GET     /api/rosters/:rosterId/offers                              coordinators
    POST    /api/rosters/:rosterId/offers                              coordinators
    GET     /api/rosters/:rosterId/compare                             coordinators
    GET     /api/runs/:id                                              coordinators
    GET     /api/runs/:id/events                                       coordinators
    POST    /api/runs/:id/cancel                                       coordinators
    GET     /api/runs/:id/concessions                                  coordinators
    POST    /api/runs/:id/concession-price                             coordinators
    GET     /api/runs/:id/seats/:seatId/alternatives                   coordinators
    GET     /api/pairings                                              coordinators
    POST    /api/pairings                                              coordinators
    PATCH   /api/pairings/:id                                          coordinators
    DELETE  /api/pairings/:id                                          coordinators
    # Each member's own shifts, wishes, pairings, feed, time away, swaps, offers and ledger: every role.
    GET     /api/me/shifts                                             members
    GET     /api/me/rosters                                            members
    GET     /api/me/rosters/:rosterId/wishes                           members
    POST    /api/me/rosters/:rosterId/wishes                           members
    POST    /api/me/rosters/:rosterId/wishes/weekly                    members
    DELETE  /api/me/rosters/:rosterId/wishes/:id                       members
    GET     /api/me/colleagues                                         members
    GET     /api/me/pairings                                           members
    POST    /api/me/pairings                                           members
    DELETE  /api/me/pairings/:id                                       members
    GET     /api/me/feed                                               members
    POST    /api/me/feed                                               members
    DELETE  /api/me/feed                                               members
    GET     /api/me/absences                                           members
    POST    /api/me/absences                                           members
    DELETE  /api/me/absences/:id                                       members
    GET     /api/me/swap-options                                       members
    GET     /api/me/swaps                                              members
    POST    /api/me/swaps/check                                        members
    POST    /api/me/swaps                                              members
    POST    /api/me/swaps/:id/accept                                   members
    POST    /api/me/swaps/:id/decline                                  members
    POST    /api/me/swaps/:id/withdraw                                 members
    GET     /api/me/offers                                             members
    POST    /api/me/offers/:id/take                                    members
    GET     /api/me/ledger                                             members
    # Coordinators decide swaps and offers and keep the ledger and time away.
    GET     /api/swaps                                                 coordinators
    POST    /api/swaps/:id/decision                                    coordinators
    POST    /api/offers/:id/decision                                   coordinators
    POST    /api/offers/:id/withdraw                                   coordinators
    GET     /api/ledger                                                coordinators
    GET     /api/ledger/settings                                       coordinators
    PUT     /api/ledger/settings                                       coordinators
    POST    /api/ledger/holidays                                       coordinators
    DELETE  /api/ledger/holidays/:id                                   coordinators
    GET     /api/absences                                              coordinators
    POST    /api/absences                                              coordinators
    GET     /api/absences/settings                                     coordinators
    PUT     /api/absences/settings                                     coordinators
    GET     /api/absences/conflicts                                    coordinators
    POST    /api/absences/import                                       coordinators
    PATCH   /api/absences/:id                                          coordinators
    POST    /api/absences/:id/decision                                 coordinators
    DELETE  /api/absences/:id                                          coordinators
    # A calendar feed is read by calendar apps, with the secret address as the only key.
    GET     /api/feeds/:token.ics                                      public
    # A prepared export is read by who may ask for it: coordinators and admins.
    GET     /api/exports/:id                                           coordinators
    GET     /api/exports/:id/file                                      coordinators
    # The payment service calls the webhook (checked by its signature); plans and invoices are the admin's.
    POST    /api/billing/webhook                                       public
    GET     /api/billing                                               admin
    POST    /api/billing/checkout                                      admin
    POST    /api/billing/seats/preview                                 admin
    POST    /api/billing/seats                                         admin
    POST    /api/billing/cancel                                        admin
    POST    /api/billing/portal                                        admin
    GET     /api/billing/invoices                                      admin
    # Health is for load balancers.
    GET     /api/health                                                public
`;

type Allowed = 'public' | 'signed-in' | 'admin' | 'coordinators' | 'members';
const ROLES_OF: Record<Exclude<Allowed, 'public' | 'signed-in'>, Role[]> = { admin: ['admin'], coordinators: ['admin', 'coordinator'], members: ['admin', 'coordinator', 'staff'] };
const table = new Map<string, Allowed>();
for (const line of WHO_MAY.split('\n').map((l) => l.trim())) {
  if (!line || line.startsWith('#')) continue;
  const [method, path, allowed, extra] = line.split(/\s+/);
  if (extra !== undefined || !['public', 'signed-in', 'admin', 'coordinators', 'members'].includes(allowed!)) throw new Error(`WHO_MAY: cannot read "${line}"`);
  const key = `${method!.toLowerCase()} ${path}`;
  if (table.has(key)) throw new Error(`WHO_MAY: ${key} twice`);
  table.set(key, allowed as Allowed);
}
const keyOf = (r: RouteSpec) => `${r.method} ${r.path}`;

/** What the guard must answer by the table: 401 signed out, 403 for a role the route does not allow, else past the guard. */
function expected(route: RouteSpec, who: Who): 401 | 403 | 'through' {
  const allowed = table.get(keyOf(route))!;
  if (allowed === 'public') return 'through';
  if (who === 'signed out') return 401;
  if (allowed === 'signed-in') return 'through';
  return ROLES_OF[allowed].includes(who) ? 'through' : 403;
}

/**
 * The role-by-route matrix: every route the app registers (routeTable, filled by building the app
 * with every router mounted) against the table above. Path ids are ones nobody has, bodies are
 * empty: a role that gets through the guard sees 2xx/3xx, 400 or 404, never 401/403/5xx.
 */
describe('role-by-route matrix', () => {
  let db: TestDb;
  let app: ReturnType<typeof makeApp>['app'];
  const routes: RouteSpec[] = [];
  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    routes.push(...routeTable);
  });
  afterAll(async () => {
    await db.drop();
  });

  it('covers every /api route, each declared with its access', () => {
    expect(routes.length).toBeGreaterThan(20);
    for (const r of routes) expect(r.path.startsWith('/api/')).toBe(true);
    const paths = routes.map((r) => `${r.method} ${r.path}`);
    for (const p of ['get /api/auth/session', 'post /api/auth/sign-in', 'get /api/members', 'post /api/invitations']) expect(paths).toContain(p);
  });

  it('has a line in the written table for every route and no line for a route that does not exist', () => {
    const registered = new Set(routes.map(keyOf));
    expect(routes.filter((r) => !table.has(keyOf(r))).map(keyOf), 'routes nobody has decided the access of').toEqual([]);
    expect([...table.keys()].filter((k) => !registered.has(k)), 'table lines without a route').toEqual([]);
  });

  it('declares for every route the access the table gives it', () => {
    const declared = (r: RouteSpec): Allowed => {
      if (r.access === 'public' || r.access === 'signed-in') return r.access;
      const roles = [...r.access].sort().join(',');
      const found = (Object.entries(ROLES_OF) as Array<[Allowed, Role[]]>).find(([, list]) => [...list].sort().join(',') === roles);
      return found ? found[0] : (`roles ${roles}` as Allowed);
    };
    expect(routes.filter((r) => declared(r) !== table.get(keyOf(r))).map((r) => `${keyOf(r)}: declares ${declared(r)}, table says ${table.get(keyOf(r))}`)).toEqual([]);
  });

  it('has no /api route that bypassed ApiRoutes (and so its guard and the matrix)', () => {
    // Walk Express's own route layers under the router mounted at /api.
    type Layer = { route?: { path: string; methods: Record<string, boolean> }; handle?: { stack?: Layer[] }; match(path: string): boolean };
    const top = (app as unknown as { router: { stack: Layer[] } }).router.stack;
    const apiRouters = top.filter((l) => l.handle?.stack && l.match('/api/zz-probe') && !l.match('/zz-probe'));
    expect(apiRouters.length).toBe(1);
    const registered: Array<{ method: string; path: string }> = [];
    const walk = (stack: Layer[]) => {
      for (const layer of stack) {
        if (layer.route) for (const method of Object.keys(layer.route.methods)) registered.push({ method, path: layer.route.path });
        else if (layer.handle?.stack) walk(layer.handle.stack);
      }
    };
    walk(apiRouters[0].handle!.stack!);
    const declared = (r: { method: string; path: string }) => routes.some((t) => t.method === r.method && (r.path === '/' ? true : t.path.endsWith(r.path)));
    expect(registered.filter((r) => !declared(r)).map((r) => `${r.method} ${r.path}`)).toEqual([]);
    expect(registered.length).toBe(routes.length);
  });

  it('answers 401 / 403 / through for every route and role', async () => {
    const workspace = await makeWorkspace('Matrix House');
    const users = new Map<Role, Awaited<ReturnType<typeof makeUser>>>();
    for (const role of ['admin', 'coordinator', 'staff'] as Role[]) users.set(role, await makeUser({ workspace, role }));
    const agents = new Map<Who, ReturnType<typeof agent>>();
    const signIn = async (who: Who) => {
      const a = agent(app);
      if (who !== 'signed out') {
        const res = await a.post('/api/auth/sign-in').send({ email: users.get(who)!.email, password: PASSWORD });
        if (res.status !== 200) throw new Error(`sign-in as ${who}: ${res.status}`);
      }
      agents.set(who, a);
    };
    for (const who of everyone) await signIn(who);

    const wrong: string[] = [];
    // Sign-out ends the session, so it goes last.
    const ordered = [...routes].sort((x, y) => Number(x.path === '/api/auth/sign-out') - Number(y.path === '/api/auth/sign-out'));
    for (const route of ordered) {
      const url = route.path.replace(/:[A-Za-z]+/g, '4000000001');
      for (const who of everyone) {
        const req = agents.get(who)![route.method](url);
        const res = route.method === 'get' || route.method === 'delete' ? await req : await req.send({});
        const want = expected(route, who);
        const ok = want === 'through' ? res.status < 500 && res.status !== 401 && res.status !== 403 : res.status === want;
        // Public routes may still say 401 for their own reasons (a wrong password), never 403 or 5xx.
        const publicOk = table.get(keyOf(route)) === 'public' && res.status === 401 && route.path.startsWith('/api/auth/');
        if (!ok && !publicOk) wrong.push(`${route.method.toUpperCase()} ${route.path} as ${who}: got ${res.status}, want ${want}`);
        // A route that changed the session (sign-in, sign-out, switch) must not spoil the next check.
        const signedInNow = (await agents.get(who)!.get('/api/auth/session')).body?.user != null;
        if (signedInNow !== (who !== 'signed out')) await signIn(who);
      }
    }
    expect(wrong).toEqual([]);
    // Four identities and two requests each for every route: minutes on a busy machine.
  }, 240_000);

  it('refuses every state-changing route without the CSRF header, before anything else', async () => {
    const admin = await makeUser({ workspace: await makeWorkspace(), role: 'admin' });
    const a = agent(app);
    await a.post('/api/auth/sign-in').send({ email: admin.email, password: PASSWORD });
    const cookie = (await a.get('/api/auth/session')).request.cookies;
    const request = (await import('supertest')).default;
    const wrong: string[] = [];
    // Exempt paths (the payment webhook) are called by a service, not a browser, and checked by signature instead.
    // And only public routes may be exempt: a route needing a session always needs the header.
    for (const exempt of CSRF_EXEMPT_PATHS) expect(routes.filter((r) => r.path === exempt).map((r) => table.get(keyOf(r)))).toEqual(['public']);
    for (const route of routes.filter((r) => r.method !== 'get' && !CSRF_EXEMPT_PATHS.has(r.path))) {
      const res = await request(app)[route.method](route.path.replace(/:[A-Za-z]+/g, '4000000001')).set('Cookie', cookie).send({});
      if (res.status !== 403 || !res.body.error?.message?.includes('X-Rotaloom-CSRF')) wrong.push(`${route.method} ${route.path}: ${res.status}`);
    }
    expect(wrong).toEqual([]);
  }, 120_000);
});
