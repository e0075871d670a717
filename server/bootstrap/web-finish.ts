import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { promisify } from 'node:util';
import { brotliCompress, constants as zlib } from 'node:zlib';
import { generateSW } from 'workbox-build';
import type { WorkboxPlugin } from 'workbox-core/types';
import { fontFileNames } from '../../constants/fonts';
import { OFFLINE_API_PATHS, OFFLINE_CACHE, OFFLINE_OWNER_KEY, SAVED_AT_HEADER } from '../../shared/offline';
import { HASHED_FILE } from '../web/hashed';
import { APP_SHELL, NOT_FOUND_PAGE, PRECOMPRESSED, ROUTES_FILE } from '../web/build-files';

export { APP_SHELL, NOT_FOUND_PAGE, PRECOMPRESSED, ROUTES_FILE };

/**
 * What the web build does after `expo export -p web`: declares the fonts in index.html and writes
 * the service worker. Part of every build (server/bootstrap/web-build.ts), so `npm start` and
 * `npm test` serve the same app a visitor gets.
 */
export async function finishWebBuild(outDir: string): Promise<void> {
  dropEmptyTitle(outDir);
  declareFonts(outDir);
  // Read before the steps below add pages of their own.
  const routes = routeTable(outDir);
  writeAppShell(outDir, routes);
  writeNotFoundPage(outDir);
  writeFileSync(path.join(outDir, ROUTES_FILE), JSON.stringify({ routes }));
  await writeServiceWorker(outDir, routes);
  await precompress(outDir);
}


/** One address of the app: its route file's path, the pattern the address matches, what its page needs besides the shell. */
export interface WebRoute {
  /** As Expo Router names it: `/my-shifts`, `/rosters/[rosterId]`. */
  path: string;
  /** Matched against a URL's pathname: `^/rosters/[^/]+/?$`. */
  pattern: string;
  /** The route's chunks (root layout, group layout, screen) beyond the shell's scripts. */
  scripts: string[];
  /** API answers the screen asks for first (DATA_FIRST). */
  data: string[];
}

/**
 * What a screen asks for as soon as its code runs, fetched from the app shell beside the code
 * instead, when someone is signed in on this browser. Only the person's own answers that the
 * service worker keeps anyway; each URL exactly as the screen's hook asks (same URL and
 * credentials, or the browser fetches twice; tests/server/web/app-shell.test.ts checks the hook).
 */
export const DATA_FIRST: Record<string, string[]> = {
  '/my-shifts': ['/api/me/shifts'],
};

const SHELL_CHUNK = /^(__expo-metro-runtime|__common|entry)-/;
const escapeRegExp = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

/**
 * The app's addresses, read from the HTML files Expo Router's static output writes, one per
 * route (`my-shifts/index.html`, `rosters/[rosterId].html`). The copies under `(group)/` folders,
 * `_sitemap` and `+not-found` are not addresses of their own. A single-page export has none.
 */
export function routeTable(outDir: string): WebRoute[] {
  if (!HYDRATE_FLAG.test(readFileSync(path.join(outDir, 'index.html'), 'utf8'))) return [];
  const routes: WebRoute[] = [];
  const visit = (rel: string) => {
    for (const entry of readdirSync(path.join(outDir, rel), { withFileTypes: true })) {
      const child = rel ? `${rel}/${entry.name}` : entry.name;
      if (entry.isDirectory()) {
        if (!/^[(_.]/.test(entry.name) && entry.name !== 'assets' && entry.name !== 'icons') visit(child);
        continue;
      }
      if (!entry.name.endsWith('.html') || /^[_+.]/.test(entry.name) || child === APP_SHELL || child === NOT_FOUND_PAGE) continue;
      const segments = child.replace(/\.html$/, '').split('/');
      if (segments[segments.length - 1] === 'index') segments.pop();
      const html = readFileSync(path.join(outDir, child), 'utf8');
      const scripts = [...html.matchAll(/<script src="\/(_expo\/static\/js\/web\/([^"]+))"/g)].filter((m) => !SHELL_CHUNK.test(m[2])).map((m) => `/${m[1]}`);
      const routePath = `/${segments.join('/')}`;
      const pattern = segments.length === 0 ? '^/$' : `^/${segments.map((seg) => (/^\[\.\.\.[^\]]+\]$/.test(seg) ? '.+' : /^\[[^\]]+\]$/.test(seg) ? '[^/]+' : escapeRegExp(seg))).join('/')}/?$`;
      routes.push({ path: routePath, pattern, scripts, data: DATA_FIRST[routePath] ?? [] });
    }
  };
  visit('');
  // Fixed segments before parameters, as Expo Router ranks them: /people/new is not /people/[id].
  const dynamic = (r: WebRoute) => (r.path.match(/\[/g) ?? []).length;
  return routes.sort((a, b) => dynamic(a) - dynamic(b) || (a.path < b.path ? -1 : a.path > b.path ? 1 : 0));
}

/**
 * The app shell's first script: finds the route of the address being opened and asks for its
 * chunks at once (the router would ask only after the entry chunk has run, one layout after
 * another) and, when someone is signed in here, the answers its screen asks for first.
 */
export function preloadScript(routes: WebRoute[]): string {
  const table = routes.filter((r) => r.scripts.length + r.data.length > 0).map((r) => [r.pattern, r.scripts, r.data]);
  return (
    `(function(){var t=${JSON.stringify(table)},p=location.pathname,s=false;` +
    `try{s=!!localStorage.getItem(${JSON.stringify(OFFLINE_OWNER_KEY)})}catch(e){}` +
    'function l(h,a){var e=document.createElement("link");e.rel="preload";e.href=h;e.as=a;if(a==="fetch")e.crossOrigin="anonymous";document.head.appendChild(e)}' +
    'for(var i=0;i<t.length;i++)if(new RegExp(t[i][0]).test(p)){t[i][1].forEach(function(h){l(h,"script")});if(s)t[i][2].forEach(function(h){l(h,"fetch")});break}})()'
  );
}


/**
 * A Brotli copy (`x.js.br`, quality 11) beside every text file of the build, which
 * server/web/static.ts sends to browsers that accept it: about a fifth smaller than the gzip the
 * server makes on the fly (the first screen's scripts: 424 KiB gzipped, 339 KiB Brotli), too slow
 * to make per request. Chromium asks for Brotli in secure contexts only (HTTPS, and localhost,
 * where the bench runs); plain HTTP to another host keeps the gzip.
 */
export async function precompress(outDir: string): Promise<number> {
  const files: string[] = [];
  const visit = (dir: string) => {
    for (const entry of readdirSync(dir, { withFileTypes: true })) {
      const file = path.join(dir, entry.name);
      if (entry.isDirectory()) visit(file);
      else if (PRECOMPRESSED.test(entry.name) && !entry.name.startsWith('.')) files.push(file);
    }
  };
  visit(outDir);
  const compress = promisify(brotliCompress);
  for (const file of files) {
    const data = readFileSync(file);
    if (data.length < 1024) continue;
    const packed = await compress(data, { params: { [zlib.BROTLI_PARAM_QUALITY]: 11, [zlib.BROTLI_PARAM_SIZE_HINT]: data.length } });
    writeFileSync(`${file}.br`, packed);
  }
  return files.length;
}

/**
 * The static renderer writes the (empty) title of expo-router's Head before app/+html.tsx's own,
 * and a browser shows the first one: the page would have no name until the code runs.
 */
export function dropEmptyTitle(outDir: string, page = 'index.html'): void {
  const indexFile = path.join(outDir, page);
  writeFileSync(indexFile, readFileSync(indexFile, 'utf8').replace(/<title data-rh="true"><\/title>/, ''));
}


/** What hooks/api/get-session.ts asks for first on every page. */
const SESSION_PATH = '/api/auth/session';

const HYDRATE_FLAG = /<script[^>]*>\s*globalThis\.__EXPO_ROUTER_HYDRATE__\s*=\s*true;?\s*<\/script>/;

/** The inner HTML of `<div id="root">…</div>`, found by counting the divs opened and closed in it. */
function rootContent(html: string): { start: number; end: number } {
  const open = html.indexOf('<div id="root">');
  if (open < 0) throw new Error('web build: index.html has no <div id="root">');
  const start = open + '<div id="root">'.length;
  const tags = /<div[\s>]|<\/div>/g;
  tags.lastIndex = start;
  let depth = 1;
  for (let m = tags.exec(html); m; m = tags.exec(html)) {
    depth += m[0] === '</div>' ? -1 : 1;
    if (depth === 0) return { start, end: m.index };
  }
  throw new Error('web build: <div id="root"> is not closed in index.html');
}

/**
 * Expo Router's static output writes each route's HTML at build time and the client hydrates it.
 * Only the landing page is served that way: its sign-in form is drawn from the HTML alone, before
 * the code arrives on a slow line. Every other address is rendered by the client as before, from
 * `app-shell.html`: the same page without the prerendered markup (the boot screen in its place)
 * and without the hydration flag, since a signed-in screen, a query string (`?token=`) or a window
 * size would otherwise differ from markup written at build time without them.
 * A single-page export (web.output "single") has nothing to hydrate: the shell is index.html as is.
 */
export function writeAppShell(outDir: string, routes: WebRoute[] = []): void {
  const html = readFileSync(path.join(outDir, 'index.html'), 'utf8');
  let shell = html;
  if (HYDRATE_FLAG.test(html)) {
    const template = readFileSync(path.resolve(import.meta.dirname, '..', '..', 'public', 'index.html'), 'utf8');
    const boot = rootContent(template);
    const rendered = rootContent(html);
    shell = html.slice(0, rendered.start) + template.slice(boot.start, boot.end) + html.slice(rendered.end);
    shell = shell.replace(HYDRATE_FLAG, '');
    // The landing page's own chunks, listed so its hydration need not wait for them, are not the shell's.
    shell = shell.replace(/<script src="\/_expo\/static\/js\/web\/([^"]+)"[^>]*><\/script>/g, (tag, name: string) =>
      /^(__expo-metro-runtime|__common|entry)-/.test(name) ? tag : '',
    );
  }
  // Every page behind sign-in waits for the session before it draws or asks for anything else:
  // asked for beside the code, it is there when the code runs (a round trip less on a slow line).
  // crossorigin="anonymous" is credentials "same-origin", as apiFetch asks, so the two match.
  if (!shell.includes('</head>')) throw new Error('web build: index.html has no </head>');
  const first = routes.length ? `<script>${preloadScript(routes)}</script>` : '';
  shell = shell.replace('</head>', `<link rel="preload" href="${SESSION_PATH}" as="fetch" crossorigin="anonymous">${first}</head>`);
  writeFileSync(path.join(outDir, APP_SHELL), shell);
}

/**
 * The page an unknown address gets, with a 404: Expo Router's own rendering of app/+not-found.tsx,
 * readable from the HTML alone, with the fonts index.html declares. Not hydrated (the client
 * renders over it), like every page but the landing page; nothing is written for a single-page
 * export, whose server answers unknown addresses with the app shell.
 */
export function writeNotFoundPage(outDir: string): void {
  const source = path.join(outDir, '+not-found.html');
  if (!existsSync(source)) return;
  const html = readFileSync(source, 'utf8');
  if (!HYDRATE_FLAG.test(html)) return;
  writeFileSync(path.join(outDir, NOT_FOUND_PAGE), html.replace(HYDRATE_FLAG, ''));
  dropEmptyTitle(outDir, NOT_FOUND_PAGE);
  declareFonts(outDir, NOT_FOUND_PAGE);
}

/**
 * Each font as an @font-face with font-display: swap (text shows at once in the system font and
 * switches when the file arrives) and a preload, so the files download beside the code instead
 * of after it. All three faces are on the first screen (headings, text, buttons).
 */
export function declareFonts(outDir: string, page = 'index.html'): void {
  const fontDir = path.join(outDir, 'assets', 'fonts');
  const exported = existsSync(fontDir) ? readdirSync(fontDir) : [];
  const faces = Object.entries(fontFileNames).map(([family, file]) => {
    const stem = file.replace(/\.ttf$/, '');
    const built = exported.find((name) => name.startsWith(`${stem}.`) && name.endsWith('.ttf'));
    if (!built) throw new Error(`web build: ${file} is missing from ${fontDir}; constants/theme.ts must still require it`);
    return { family, url: `/assets/fonts/${built}` };
  });
  const head = [
    ...faces.map((f) => `<link rel="preload" href="${f.url}" as="font" type="font/ttf" crossorigin>`),
    `<style id="rotaloom-fonts">${faces.map((f) => `@font-face{font-family:"${f.family}";src:url(${f.url}) format("truetype");font-display:swap}`).join('')}</style>`,
  ].join('');
  const indexFile = path.join(outDir, page);
  const html = readFileSync(indexFile, 'utf8');
  if (!html.includes('</head>')) throw new Error(`web build: ${page} has no </head>`);
  writeFileSync(indexFile, html.replace('</head>', `${head}</head>`));
}

/** The scripts index.html loads at once (runtime, shared chunk, entry): the rest of the app shell. */
export function shellScripts(outDir: string): string[] {
  const html = readFileSync(path.join(outDir, 'index.html'), 'utf8');
  return [...html.matchAll(/<script src="\/([^"]+)"/g)].map((m) => m[1]);
}

const escape = (s: string) => s.replace(/[.*+?^${}()|[\]\\/]/g, '\\$&');

/** Matches the kept API answers by pathname, with or without a query (`/api/me/shifts?week=…`). */
export const OFFLINE_API_PATTERN = new RegExp(`^[a-z]+://[^/]+(?:${OFFLINE_API_PATHS.map(escape).join('|')})(?:\\?|$)`);

/**
 * workbox-build writes a plugin's functions into sw.js by their source text, so the header name
 * goes into that text here. Only a 200 is kept (never a 401 after signing out), stamped with when.
 */
const stampSavedAt: WorkboxPlugin = {
  cacheWillUpdate: new Function(
    '{ response }',
    `if (!response || response.status !== 200) return null;
     const headers = new Headers(response.headers);
     headers.set(${JSON.stringify(SAVED_AT_HEADER)}, new Date().toISOString());
     return new Response(response.body, { status: response.status, statusText: response.statusText, headers });`,
  ) as WorkboxPlugin['cacheWillUpdate'],
};

/**
 * A Workbox service worker: the app shell precached (the page, the scripts it loads, fonts,
 * icons, the manifest); screens' chunks and images kept as they are first opened (their names
 * carry their content hash, so a kept copy never goes stale); the signed-in person's own session
 * and published shifts from the network first, their last good copy when the network fails.
 * The client deletes that copy at sign-out and whenever someone else signs in (hooks/offline/).
 */
export async function writeServiceWorker(outDir: string, routes: WebRoute[] = []): Promise<{ count: number; size: number }> {
  const { count, size, warnings } = await generateSW({
    swDest: path.join(outDir, 'sw.js'),
    globDirectory: outDir,
    globPatterns: ['index.html', APP_SHELL, 'manifest.webmanifest', 'icons/*.{png,svg}', 'assets/fonts/*.ttf', ...shellScripts(outDir)],
    // As the server answers: the landing page its own prerendered HTML ('/' is index.html), every
    // other page the app shell, and the client router decides.
    navigateFallback: `/${APP_SHELL}`,
    // Only the app's own addresses (any query): an unknown one goes to the server for its 404 page.
    ...(routes.length ? { navigateFallbackAllowlist: routes.map((r) => new RegExp(r.pattern.replace(/\$$/, '(?:\\?.*)?$'))) } : {}),
    navigateFallbackDenylist: [/^\/api\//, /^\/dev\//],
    dontCacheBustURLsMatching: HASHED_FILE,
    cleanupOutdatedCaches: true,
    clientsClaim: true,
    skipWaiting: true,
    inlineWorkboxRuntime: true,
    mode: 'production',
    sourcemap: false,
    runtimeCaching: [
      { urlPattern: /\/_expo\/static\/js\/.+\.js$/, handler: 'CacheFirst', options: { cacheName: 'rotaloom-code', expiration: { maxEntries: 150 } } },
      { urlPattern: /\/assets\//, handler: 'CacheFirst', options: { cacheName: 'rotaloom-assets', expiration: { maxEntries: 80 } } },
      { urlPattern: OFFLINE_API_PATTERN, handler: 'NetworkFirst', options: { cacheName: OFFLINE_CACHE, plugins: [stampSavedAt] } },
    ],
  });
  if (warnings.length) console.log(`[web] service worker: ${warnings.join('; ')}`);
  return { count, size };
}
