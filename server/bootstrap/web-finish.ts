import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { promisify } from 'node:util';
import { brotliCompress, constants as zlib } from 'node:zlib';
import { generateSW } from 'workbox-build';
import type { WorkboxPlugin } from 'workbox-core/types';
import { fontFileNames } from '../../constants/fonts';
import { OFFLINE_API_PATHS, OFFLINE_CACHE, SAVED_AT_HEADER } from '../../shared/offline';
import { HASHED_FILE } from '../web/hashed';

/**
 * What the web build does after `expo export -p web`: declares the fonts in index.html and writes
 * the service worker. Part of every build (server/bootstrap/web-build.ts), so `npm start` and
 * `npm test` serve the same app a visitor gets.
 */
export async function finishWebBuild(outDir: string): Promise<void> {
  dropEmptyTitle(outDir);
  declareFonts(outDir);
  writeAppShell(outDir);
  await writeServiceWorker(outDir);
  await precompress(outDir);
}

/** What a browser may be sent Brotli-compressed: text, and the fonts (TrueType shrinks by half). */
export const PRECOMPRESSED = /\.(js|html|css|json|webmanifest|svg|ttf)$/;

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
      else if (PRECOMPRESSED.test(entry.name)) files.push(file);
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
export function dropEmptyTitle(outDir: string): void {
  const indexFile = path.join(outDir, 'index.html');
  writeFileSync(indexFile, readFileSync(indexFile, 'utf8').replace(/<title data-rh="true"><\/title>/, ''));
}

/** The page every address but the landing page gets (server/web/static.ts, the service worker). */
export const APP_SHELL = 'app-shell.html';

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
export function writeAppShell(outDir: string): void {
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
  shell = shell.replace('</head>', `<link rel="preload" href="${SESSION_PATH}" as="fetch" crossorigin="anonymous"></head>`);
  writeFileSync(path.join(outDir, APP_SHELL), shell);
}

/**
 * Each font as an @font-face with font-display: swap (text shows at once in the system font and
 * switches when the file arrives) and a preload, so the files download beside the code instead
 * of after it. All three faces are on the first screen (headings, text, buttons).
 */
export function declareFonts(outDir: string): void {
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
  const indexFile = path.join(outDir, 'index.html');
  const html = readFileSync(indexFile, 'utf8');
  if (!html.includes('</head>')) throw new Error('web build: index.html has no </head>');
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
export async function writeServiceWorker(outDir: string): Promise<{ count: number; size: number }> {
  const { count, size, warnings } = await generateSW({
    swDest: path.join(outDir, 'sw.js'),
    globDirectory: outDir,
    globPatterns: ['index.html', APP_SHELL, 'manifest.webmanifest', 'icons/*.{png,svg}', 'assets/fonts/*.ttf', ...shellScripts(outDir)],
    // As the server answers: the landing page its own prerendered HTML ('/' is index.html), every
    // other page the app shell, and the client router decides.
    navigateFallback: `/${APP_SHELL}`,
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
