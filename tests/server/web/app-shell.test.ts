import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import express from 'express';
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
    expect(shell).toMatch(/^<!DOCTYPE html><html lang="en"><head><title>Rotaloom<\/title><\/head><body><div id="root">/);
    expect([...shell.matchAll(/<script src="\/_expo\/static\/js\/web\/([a-z_-]+)-/g)].map((m) => m[1])).toEqual(['__expo-metro-runtime', '__common', 'entry']);
    // the root's closing tag found by counting: what followed it is still there, once
    expect(shell.split('</div><script').length).toBe(2);
  });

  it('leaves a single-page export as it is', () => {
    const html = '<!DOCTYPE html><html><body><div id="root"><div class="boot">Opening Rotaloom…</div></div><script src="/x.js"></script></body></html>';
    const dir = exportDir(html);
    writeAppShell(dir);
    expect(readFileSync(path.join(dir, APP_SHELL), 'utf8')).toBe(html);
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
