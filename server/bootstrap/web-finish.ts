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
  declareFonts(outDir);
  await writeServiceWorker(outDir);
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
    globPatterns: ['index.html', 'manifest.webmanifest', 'icons/*.{png,svg}', 'assets/fonts/*.ttf', ...shellScripts(outDir)],
    // The export is a single-page app: every page offline is index.html, the client router decides.
    navigateFallback: '/index.html',
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
