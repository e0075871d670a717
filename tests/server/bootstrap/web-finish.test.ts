import { describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { declareFonts, OFFLINE_API_PATTERN, shellScripts, writeServiceWorker } from '../../../server/bootstrap/web-finish';
import { fontFileNames } from '../../../constants/fonts';
import { OFFLINE_CACHE } from '../../../shared/offline';

const rootDir = path.resolve(import.meta.dirname, '..', '..', '..');

/** A small export as `expo export -p web` lays it out: index.html with its scripts, hashed fonts. */
function fakeExport(): string {
  const dir = mkdtempSync(path.join(os.tmpdir(), 'rotaloom-web-finish-'));
  mkdirSync(path.join(dir, '_expo/static/js/web'), { recursive: true });
  mkdirSync(path.join(dir, 'assets/fonts'), { recursive: true });
  mkdirSync(path.join(dir, 'icons'), { recursive: true });
  const scripts = ['__common-0123456789abcdef0123456789abcdef.js', 'entry-fedcba9876543210fedcba9876543210.js'];
  for (const s of [...scripts, 'index-00112233445566778899aabbccddeeff.js']) writeFileSync(path.join(dir, '_expo/static/js/web', s), `/* ${s} */`);
  for (const file of Object.values(fontFileNames)) writeFileSync(path.join(dir, 'assets/fonts', file.replace('.ttf', '.0123456789abcdef0123456789abcdef.ttf')), 'font');
  writeFileSync(path.join(dir, 'icons/icon-192.png'), 'png');
  writeFileSync(path.join(dir, 'manifest.webmanifest'), '{}');
  writeFileSync(path.join(dir, 'index.html'), `<!DOCTYPE html><html><head><title>Rotaloom</title></head><body><div id="root"></div>${scripts.map((s) => `<script src="/_expo/static/js/web/${s}" defer></script>`).join('')}</body></html>`);
  return dir;
}

describe('the web build after expo export', () => {
  it('declares each font once with font-display: swap and preloads it (CSS Fonts Level 4 §4.9; HTML preload needs crossorigin for fonts)', () => {
    const dir = fakeExport();
    declareFonts(dir);
    const html = readFileSync(path.join(dir, 'index.html'), 'utf8');
    for (const [family, file] of Object.entries(fontFileNames)) {
      const url = `/assets/fonts/${file.replace('.ttf', '.0123456789abcdef0123456789abcdef.ttf')}`;
      expect(html).toContain(`<link rel="preload" href="${url}" as="font" type="font/ttf" crossorigin>`);
      const face = html.match(new RegExp(`@font-face\\{font-family:"${family}";src:url\\(([^)]+)\\)[^}]*\\}`));
      expect(face?.[1]).toBe(url);
      expect(face?.[0]).toContain('font-display:swap');
    }
    // in the head, before the scripts, so the downloads start together
    expect(html.indexOf('rel="preload"')).toBeLessThan(html.indexOf('</head>'));
  });

  it('refuses to build when a font file is missing rather than shipping text in the wrong font', () => {
    const dir = fakeExport();
    writeFileSync(path.join(dir, 'index.html'), '<html><head></head><body></body></html>');
    const fonts = path.join(dir, 'assets/fonts');
    rmAll(fonts);
    expect(() => declareFonts(dir)).toThrow(/missing/);
  });

  it('precaches the app shell: the page, the scripts it loads, fonts, icons and the manifest; not the screens', async () => {
    const dir = fakeExport();
    expect(shellScripts(dir)).toEqual(['_expo/static/js/web/__common-0123456789abcdef0123456789abcdef.js', '_expo/static/js/web/entry-fedcba9876543210fedcba9876543210.js']);
    await writeServiceWorker(dir);
    const sw = readFileSync(path.join(dir, 'sw.js'), 'utf8');
    const urls = [...sw.matchAll(/url:"([^"]+)"/g)].map((m) => m[1]).sort();
    expect(urls).toEqual(
      [
        '_expo/static/js/web/__common-0123456789abcdef0123456789abcdef.js',
        '_expo/static/js/web/entry-fedcba9876543210fedcba9876543210.js',
        'icons/icon-192.png',
        'index.html',
        'manifest.webmanifest',
        ...Object.values(fontFileNames).map((f) => `assets/fonts/${f.replace('.ttf', '.0123456789abcdef0123456789abcdef.ttf')}`),
      ].sort(),
    );
    expect(sw).toContain(`"${OFFLINE_CACHE}"`);
    expect(sw).toContain('x-rotaloom-saved-at');
  });

  it('answers only the app’s own addresses with the shell when offline or not; an unknown one goes to the server for its 404', async () => {
    const dir = fakeExport();
    await writeServiceWorker(dir, [
      { path: '/my-shifts', pattern: '^/my-shifts/?$', scripts: [], data: [] },
      { path: '/rosters/[rosterId]', pattern: '^/rosters/[^/]+/?$', scripts: [], data: [] },
    ]);
    const sw = readFileSync(path.join(dir, 'sw.js'), 'utf8');
    const listed = sw.match(/\{allowlist:\[(.*?)\],denylist:/);
    expect(listed).not.toBeNull();
    // Workbox tests a navigation's pathname and search against these (workbox-routing NavigationRoute)
    const allow = new Function(`return [${listed![1]}]`)() as RegExp[];
    const handled = (url: string) => allow.some((re) => re.test(url));
    for (const url of ['/my-shifts', '/my-shifts/', '/my-shifts?week=2027-03-01', '/rosters/12', '/rosters/12?section=result']) expect(handled(url), url).toBe(true);
    for (const url of ['/no/such/page', '/rosters/12/runs', '/my-shiftsx', '/rosters']) expect(handled(url), url).toBe(false);
  });

  it('keeps only the signed-in person’s own answers: the session and /api/me/shifts (any week), nothing about others', () => {
    const kept = ['http://127.0.0.1:3000/api/auth/session', 'http://127.0.0.1:3000/api/me/shifts', 'https://rota.example/api/me/shifts?week=2027-02-03'];
    const notKept = [
      'http://127.0.0.1:3000/api/me/shifts-of-everyone',
      'http://127.0.0.1:3000/api/me/feed',
      'http://127.0.0.1:3000/api/people',
      'http://127.0.0.1:3000/api/rosters/4/shifts',
      'http://127.0.0.1:3000/api/runs/9',
      'http://127.0.0.1:3000/my-shifts?from=/api/me/shifts',
    ];
    for (const url of kept) expect(OFFLINE_API_PATTERN.test(url), url).toBe(true);
    for (const url of notKept) expect(OFFLINE_API_PATTERN.test(url), url).toBe(false);
  });
});

describe('the web app manifest (W3C Web Application Manifest; PNG sizes read from the IHDR chunk, ISO/IEC 15948 §11.2.2)', () => {
  const manifest = JSON.parse(readFileSync(path.join(rootDir, 'public/manifest.webmanifest'), 'utf8')) as {
    display: string;
    theme_color: string;
    background_color: string;
    start_url: string;
    scope: string;
    icons: Array<{ src: string; sizes: string; type: string; purpose: string }>;
  };
  const appJson = JSON.parse(readFileSync(path.join(rootDir, 'app.json'), 'utf8')) as { expo: { web: { themeColor: string; backgroundColor: string } } };

  it('opens standalone, inside its scope, in the colours index.html and app.json name', () => {
    expect(manifest.display).toBe('standalone');
    expect(manifest.theme_color).toBe(appJson.expo.web.themeColor);
    expect(manifest.background_color).toBe(appJson.expo.web.backgroundColor);
    expect(manifest.start_url.startsWith(manifest.scope)).toBe(true);
  });

  it('has PNG icons of 192 and 512 px (what Chromium asks for to offer installing) and a maskable one, each as large as it says', () => {
    const pngs = manifest.icons.filter((i) => i.type === 'image/png');
    const sizes = pngs.map((i) => i.sizes);
    expect(sizes).toEqual(expect.arrayContaining(['192x192', '512x512']));
    expect(pngs.some((i) => i.purpose.split(' ').includes('maskable'))).toBe(true);
    for (const icon of pngs) {
      const bytes = readFileSync(path.join(rootDir, 'public', icon.src));
      expect(bytes.subarray(0, 8)).toEqual(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]));
      expect(bytes.subarray(12, 16).toString('ascii')).toBe('IHDR');
      expect(`${bytes.readUInt32BE(16)}x${bytes.readUInt32BE(20)}`).toBe(icon.sizes);
    }
  });
});

function rmAll(dir: string): void {
  for (const name of readdirSync(dir)) rmSync(path.join(dir, name));
}
