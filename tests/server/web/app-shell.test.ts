import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import express from 'express';
import http from 'node:http';
import request from 'supertest';
import { APP_SHELL, writeAppShell } from '../../../server/bootstrap/web-finish';
import { webRouter } from '../../../server/web/static';

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
    const { mkdirSync } = await import('node:fs');
    const { brotliDecompressSync } = await import('node:zlib');
    mkdirSync(path.join(dir, '_expo/static/js/web'), { recursive: true });
    const code = `console.log(${JSON.stringify('Rotaloom '.repeat(2000))});`;
    const name = '_expo/static/js/web/entry-0123456789abcdef3.js';
    writeFileSync(path.join(dir, name), code);
    writeAppShell(dir);
    const { precompress } = await import('../../../server/bootstrap/web-finish');
    await precompress(dir);
    const app = express().use(webRouter(dir));
    // plain node:http, so the bytes are read as sent (supertest would decode them)
    const server = app.listen(0, '127.0.0.1');
    await new Promise((r) => server.once('listening', r));
    const { port } = server.address() as import('node:net').AddressInfo;
    const get = (url: string, encodings: string) =>
      new Promise<{ headers: import('node:http').IncomingHttpHeaders; body: Buffer }>((resolve, reject) => {
        http.get({ host: '127.0.0.1', port, path: url, headers: { 'Accept-Encoding': encodings } }, (r) => {
          const chunks: Buffer[] = [];
          r.on('data', (c: Buffer) => chunks.push(c));
          r.on('end', () => resolve({ headers: r.headers, body: Buffer.concat(chunks) }));
        }).on('error', reject);
      });
    const br = await get(`/${name}`, 'gzip, deflate, br');
    const page = await get('/my-shifts', 'br');
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
