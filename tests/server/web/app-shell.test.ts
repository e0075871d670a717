import { describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import vm from 'node:vm';
import { brotliDecompressSync } from 'node:zlib';
import express from 'express';
import request from 'supertest';
import { APP_SHELL, DATA_FIRST, NOT_FOUND_PAGE, precompress, preloadScript, ROUTES_FILE, routeTable, writeAppShell, writeNotFoundPage } from '../../../server/bootstrap/web-finish';
import { webRouter } from '../../../server/web/static';
import { OFFLINE_OWNER_KEY } from '../../../shared/offline';
import { fontFileNames } from '../../../constants/fonts';
import { rawServer } from '../helpers/raw-http';

/** An export as Expo Router's static output writes it: the landing page rendered, the hydration flag, its own chunks. */
const RENDERED = [
  '<!DOCTYPE html><html lang="en"><head><title>Rotaloom</title></head><body><div id="root">',
  '<div class="a"><div><button data-testid="sign-in-submit">Sign in</button></div><div></div></div>',
  '</div><script type="module">globalThis.__EXPO_ROUTER_HYDRATE__=true;</script>',
  '<script src="/_expo/static/js/web/__expo-metro-runtime-0123456789abcdef0.js" defer></script>',
  '<script src="/_expo/static/js/web/index-0123456789abcdef1.js" defer></script>',
  '<script src="/_expo/static/js/web/__common-0123456789abcdef2.js" defer></script>',
  '<script src="/_expo/static/js/web/entry-0123456789abcdef3.js" defer></script>',
  // over the 1 KB below which no Brotli copy is made
  `<noscript>${'Rotaloom needs JavaScript to run. '.repeat(40)}</noscript>`,
  '</body></html>',
].join('');

function exportDir(html: string): string {
  const dir = mkdtempSync(path.join(os.tmpdir(), 'rotaloom-shell-'));
  writeFileSync(path.join(dir, 'index.html'), html);
  return dir;
}

describe('the app shell: the landing page prerendered, every other page rendered by the client', () => {
  it('keeps the page around the root, puts the boot screen in it and drops the hydration flag and the landing chunks', () => {
    const dir = exportDir(RENDERED);
    writeAppShell(dir);
    const shell = readFileSync(path.join(dir, APP_SHELL), 'utf8');
    expect(shell).not.toContain('sign-in-submit');
    expect(shell).not.toContain('__EXPO_ROUTER_HYDRATE__');
    expect(shell).toContain('Opening Rotaloom');
    expect(shell).toMatch(/^<!DOCTYPE html><html lang="en"><head><title>Rotaloom<\/title><link rel="preload" href="\/api\/auth\/session" as="fetch" crossorigin="anonymous"><\/head><body><div id="root">/);
    expect([...shell.matchAll(/<script src="\/_expo\/static\/js\/web\/([a-z_-]+)-/g)].map((m) => m[1])).toEqual(['__expo-metro-runtime', '__common', 'entry']);
    // the root's closing tag found by counting: what followed it is still there, once
    expect(shell.split('</div><script').length).toBe(2);
  });

  it('leaves a single-page export as it is, but for asking for the session beside the code', () => {
    const html = '<!DOCTYPE html><html><head></head><body><div id="root"><div class="boot">Opening Rotaloom…</div></div><script src="/x.js"></script></body></html>';
    const dir = exportDir(html);
    writeAppShell(dir);
    expect(readFileSync(path.join(dir, APP_SHELL), 'utf8')).toBe(html.replace('</head>', '<link rel="preload" href="/api/auth/session" as="fetch" crossorigin="anonymous"></head>'));
  });

  it('serves the prerendered page at / only and the shell everywhere else, as the service worker does', async () => {
    const dir = exportDir(RENDERED);
    writeAppShell(dir);
    const app = express().use(webRouter(dir));
    const landing = await request(app).get('/');
    expect(landing.text).toContain('sign-in-submit');
    for (const url of ['/my-shifts', '/rosters/12', '/reset-password?token=abc', '/no/such/page']) {
      const page = await request(app).get(url);
      expect(page.status, url).toBe(200);
      expect(page.headers['cache-control'], url).toBe('no-cache');
      expect(page.text, url).toContain('Opening Rotaloom');
      expect(page.text, url).not.toContain('__EXPO_ROUTER_HYDRATE__');
    }
  });
});

describe('Brotli copies made at build time', () => {
  it('sends the .br copy to a browser that accepts Brotli (RFC 7932, read back with node:zlib), gzip or nothing to others', async () => {
    const dir = exportDir(RENDERED);
    mkdirSync(path.join(dir, '_expo/static/js/web'), { recursive: true });
    const code = `console.log(${JSON.stringify('Rotaloom '.repeat(2000))});`;
    const name = '_expo/static/js/web/entry-0123456789abcdef3.js';
    writeFileSync(path.join(dir, name), code);
    writeAppShell(dir);
    await precompress(dir);
    const app = express().use(webRouter(dir));
    const server = await rawServer(app);
    const br = await server.get(`/${name}`, 'gzip, deflate, br');
    const page = await server.get('/my-shifts', 'br');
    server.close();
    expect(br.headers['content-encoding']).toBe('br');
    expect(br.headers['content-type']).toMatch(/javascript/);
    expect(br.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    expect(brotliDecompressSync(br.body).toString()).toBe(code);
    expect(page.headers['content-encoding']).toBe('br');
    expect(page.headers['content-type']).toMatch(/text\/html/);
    expect(page.headers['cache-control']).toBe('no-cache');
    expect(brotliDecompressSync(page.body).toString()).toContain('Opening Rotaloom');
    const plain = await request(app).get(`/${name}`).set('Accept-Encoding', 'gzip');
    expect(plain.headers['content-encoding']).toBeUndefined(); // this bare app has no compression middleware
    expect(plain.text).toBe(code);
  });
});

/** A page of the static export for one route: the shell's scripts and the route's own chunks. */
const routePage = (chunks: string[], body = '<div>screen</div>') =>
  [
    '<!DOCTYPE html><html lang="en"><head><title data-rh="true"></title><title>Rotaloom</title></head><body><div id="root">',
    body,
    '</div><script type="module">globalThis.__EXPO_ROUTER_HYDRATE__=true;</script>',
    ...['__expo-metro-runtime-0123456789abcdef0', ...chunks, '__common-0123456789abcdef2', 'entry-0123456789abcdef3'].map((c) => `<script src="/_expo/static/js/web/${c}.js" defer></script>`),
    '</body></html>',
  ].join('');

/** An export as Expo Router's static output lays it out, one HTML file per route (and copies under the groups). */
function staticExport(): string {
  const dir = exportDir(RENDERED);
  const pages: Record<string, string> = {
    'my-shifts/index.html': routePage(['_layout-aaaaaaaaaaaaaaaa0', '_layout-bbbbbbbbbbbbbbbb0', 'index-cccccccccccccccc0']),
    '(workspace)/my-shifts/index.html': routePage(['_layout-aaaaaaaaaaaaaaaa0', '_layout-bbbbbbbbbbbbbbbb0', 'index-cccccccccccccccc0']),
    'rosters/[rosterId].html': routePage(['_layout-aaaaaaaaaaaaaaaa0', '_layout-bbbbbbbbbbbbbbbb0', '[rosterId]-dddddddddddddddd0']),
    'rosters/index.html': routePage(['_layout-aaaaaaaaaaaaaaaa0', '_layout-bbbbbbbbbbbbbbbb0', 'index-eeeeeeeeeeeeeeee0']),
    'people/[id].html': routePage(['_layout-aaaaaaaaaaaaaaaa0', '_layout-bbbbbbbbbbbbbbbb0', '[id]-ffffffffffffffff0']),
    'people/new.html': routePage(['_layout-aaaaaaaaaaaaaaaa0', '_layout-bbbbbbbbbbbbbbbb0', 'new-9999999999999999a']),
    'reset-password.html': routePage(['_layout-aaaaaaaaaaaaaaaa0', 'reset-password-9999999999999999b']),
    '_sitemap.html': routePage(['_layout-aaaaaaaaaaaaaaaa0', '_sitemap-9999999999999999c']),
    '+not-found.html': routePage(
      ['_layout-aaaaaaaaaaaaaaaa0', '+not-found-9999999999999999d'],
      `<div><h1 role="heading">This page is not on the roster</h1><a href="/">Back to the start</a></div>${'<div></div>'.repeat(100)}`,
    ),
  };
  for (const [file, html] of Object.entries(pages)) {
    mkdirSync(path.dirname(path.join(dir, file)), { recursive: true });
    writeFileSync(path.join(dir, file), html);
  }
  mkdirSync(path.join(dir, 'assets/fonts'), { recursive: true });
  for (const file of Object.values(fontFileNames)) writeFileSync(path.join(dir, 'assets/fonts', file.replace('.ttf', '.0123456789abcdef0123456789abcdef.ttf')), 'font');
  return dir;
}

/**
 * Runs the shell's first script as a browser would (node:vm with the DOM calls it makes) and
 * answers the links it added to the head.
 */
function preloadsFor(script: string, pathname: string, signedIn: boolean): Array<{ rel: string; href: string; as: string; crossOrigin?: string }> {
  const added: Array<{ rel: string; href: string; as: string; crossOrigin?: string }> = [];
  const storage = new Map(signedIn ? [[OFFLINE_OWNER_KEY, '7:3']] : []);
  vm.runInNewContext(script, {
    location: { pathname },
    localStorage: { getItem: (k: string) => storage.get(k) ?? null },
    document: { createElement: () => ({}), head: { appendChild: (el: (typeof added)[number]) => added.push(el) } },
  });
  return added;
}

describe('the app’s addresses, from the static export', () => {
  const chunk = (name: string) => `/_expo/static/js/web/${name}.js`;
  const layouts = [chunk('_layout-aaaaaaaaaaaaaaaa0'), chunk('_layout-bbbbbbbbbbbbbbbb0')];

  it('lists one route per page file, fixed segments before parameters, with the chunks beyond the shell', () => {
    const routes = routeTable(staticExport());
    expect(routes.map((r) => r.path)).toEqual(['/', '/my-shifts', '/people/new', '/reset-password', '/rosters', '/people/[id]', '/rosters/[rosterId]']);
    const byPath = new Map(routes.map((r) => [r.path, r]));
    expect(byPath.get('/my-shifts')).toEqual({ path: '/my-shifts', pattern: '^/my-shifts/?$', scripts: [...layouts, chunk('index-cccccccccccccccc0')], data: ['/api/me/shifts'] });
    expect(byPath.get('/rosters/[rosterId]')!.scripts).toEqual([...layouts, chunk('[rosterId]-dddddddddddddddd0')]);
    const matches = (url: string) => routes.filter((r) => new RegExp(r.pattern).test(url)).map((r) => r.path);
    expect(matches('/rosters/12')).toEqual(['/rosters/[rosterId]']);
    expect(matches('/rosters/12/')).toEqual(['/rosters/[rosterId]']);
    expect(matches('/rosters')).toEqual(['/rosters']);
    expect(matches('/rosters/12/runs')).toEqual([]);
    expect(matches('/people/new')).toEqual(['/people/new', '/people/[id]']);
    expect(matches('/my-shiftsx')).toEqual([]);
    expect(matches('/no/such/page')).toEqual([]);
    // a single-page export (no hydration flag) has no route pages to read
    expect(routeTable(exportDir('<!DOCTYPE html><html><head></head><body><div id="root"></div></body></html>'))).toEqual([]);
  });

  it('asks for the route’s chunks from the shell, and for my shifts’ answer only when someone is signed in here', () => {
    const script = preloadScript(routeTable(staticExport()));
    const scripts = (links: ReturnType<typeof preloadsFor>) => links.filter((l) => l.as === 'script').map((l) => l.href);
    const signedIn = preloadsFor(script, '/my-shifts', true);
    expect(scripts(signedIn)).toEqual([...layouts, chunk('index-cccccccccccccccc0')]);
    // HTML §2.5.4: crossorigin="anonymous" is credentials mode "same-origin", the mode apiFetch uses, so the page's fetch takes this answer
    expect(signedIn.filter((l) => l.as === 'fetch')).toEqual([{ rel: 'preload', href: '/api/me/shifts', as: 'fetch', crossOrigin: 'anonymous' }]);
    expect(signedIn.every((l) => l.rel === 'preload')).toBe(true);
    expect(preloadsFor(script, '/my-shifts', false).filter((l) => l.as === 'fetch')).toEqual([]);
    expect(scripts(preloadsFor(script, '/people/new', true))).toEqual([...layouts, chunk('new-9999999999999999a')]);
    expect(scripts(preloadsFor(script, '/rosters/4', false))).toEqual([...layouts, chunk('[rosterId]-dddddddddddddddd0')]);
    expect(preloadsFor(script, '/no/such/page', true)).toEqual([]);
  });

  it('asks for the same URL with the same credentials as the my-shifts screen’s hook (Fetch: a preload is used only when they match)', async () => {
    const calls: Array<{ url: string; init: RequestInit }> = [];
    const realFetch = globalThis.fetch;
    globalThis.fetch = (async (url: string, init: RequestInit) => {
      calls.push({ url, init });
      return new Response(JSON.stringify({ shifts: [] }), { status: 200, headers: { 'content-type': 'application/json' } });
    }) as typeof fetch;
    try {
      const { getMyShifts } = await import('../../../hooks/api/get-my-shifts');
      await getMyShifts();
    } finally {
      globalThis.fetch = realFetch;
    }
    expect(calls.map((c) => c.url)).toEqual(DATA_FIRST['/my-shifts']);
    expect(calls[0].init.credentials).toBe('same-origin');
    expect(calls[0].init.method ?? 'GET').toBe('GET');
  });

  it('answers 404 with the not-found page, readable from the HTML, for an address that is no route and no file; 200 for the app’s own', async () => {
    const dir = staticExport();
    await finishSteps(dir);
    const notFound = readFileSync(path.join(dir, NOT_FOUND_PAGE), 'utf8');
    expect(notFound).not.toContain('__EXPO_ROUTER_HYDRATE__');
    expect(notFound).not.toContain('<title data-rh="true"></title>');
    // drawn in the app's own faces from the start, as index.html is
    for (const family of Object.keys(fontFileNames)) expect(notFound).toContain(`@font-face{font-family:"${family}"`);
    const app = express().use(webRouter(dir));
    for (const url of ['/no/such/page', '/rosters/12/runs', '/my-shiftsx', '/_expo/static/js/web/entry-00000000000000000.js', '/.rotaloom-routes.json']) {
      const res = await request(app).get(url);
      expect(res.status, url).toBe(404);
      expect(res.headers['content-type'], url).toMatch(/^text\/html/);
      expect(res.headers['cache-control'], url).toBe('no-cache');
      expect(res.text, url).toContain('This page is not on the roster');
      expect(res.text, url).toContain('<a href="/">Back to the start</a>');
    }
    // the Brotli copy keeps the status (plain node:http: the bytes as sent)
    const server = await rawServer(app);
    const br = await server.get('/no/such/page', 'br');
    server.close();
    expect(br.status).toBe(404);
    expect(br.headers['content-encoding']).toBe('br');
    expect(brotliDecompressSync(br.body).toString()).toContain('This page is not on the roster');
    for (const url of ['/my-shifts', '/my-shifts/', '/rosters', '/rosters/12', '/rosters/12?section=result', '/people/new', '/reset-password?token=abc']) {
      const res = await request(app).get(url);
      expect(res.status, url).toBe(200);
      expect(res.text, url).toContain('Opening Rotaloom');
    }
    expect((await request(app).get('/')).text).toContain('sign-in-submit');
  });
});

/** The steps of finishWebBuild that need no fonts or workbox: the shell, the not-found page, the route list. */
async function finishSteps(dir: string): Promise<void> {
  const routes = routeTable(dir);
  writeAppShell(dir, routes);
  writeNotFoundPage(dir);
  writeFileSync(path.join(dir, ROUTES_FILE), JSON.stringify({ routes }));
  await precompress(dir);
}
