import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { PASSWORD, agent, makeApp, makeUser, makeWorkspace } from '../auth/helpers';
import { routeTable, type Access, type RouteSpec } from '../../../server/http/routes';
import type { Role } from '../../../server/db/models';
import { CSRF_EXEMPT_PATHS } from '../../../server/auth/csrf';

type Who = 'signed out' | Role;
const everyone: Who[] = ['signed out', 'admin', 'coordinator', 'staff'];

/** What the guard must answer: 401 signed out, 403 for a role the route does not allow, else past the guard. */
function expected(access: Access, who: Who): 401 | 403 | 'through' {
  if (access === 'public') return 'through';
  if (who === 'signed out') return 401;
  if (access === 'signed-in') return 'through';
  return access.includes(who) ? 'through' : 403;
}

/**
 * The role-by-route matrix, generated from routeTable (filled by building the app with every
 * router mounted), so a new route is checked the moment it exists. Path ids are ones nobody has,
 * bodies are empty: a role that gets through the guard sees 2xx/3xx, 400 or 404, never 401/403/5xx.
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
        const want = expected(route.access, who);
        const ok = want === 'through' ? res.status < 500 && res.status !== 401 && res.status !== 403 : res.status === want;
        // Public routes may still say 401 for their own reasons (a wrong password), never 403 or 5xx.
        const publicOk = route.access === 'public' && res.status === 401 && route.path.startsWith('/api/auth/');
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
    for (const exempt of CSRF_EXEMPT_PATHS) expect(routes.filter((r) => r.path === exempt).map((r) => r.access)).toEqual(['public']);
    for (const route of routes.filter((r) => r.method !== 'get' && !CSRF_EXEMPT_PATHS.has(r.path))) {
      const res = await request(app)[route.method](route.path.replace(/:[A-Za-z]+/g, '4000000001')).set('Cookie', cookie).send({});
      if (res.status !== 403 || !res.body.error?.message?.includes('X-Rotaloom-CSRF')) wrong.push(`${route.method} ${route.path}: ${res.status}`);
    }
    expect(wrong).toEqual([]);
  }, 120_000);
});
