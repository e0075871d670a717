import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
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
