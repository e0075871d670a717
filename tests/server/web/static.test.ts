import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, mkdirSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { gunzipSync } from 'node:zlib';
import request from 'supertest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp } from '../auth/helpers';
import { rawServer } from '../helpers/raw-http';

describe('the web app and API answers: compressed, and cached for as long as they cannot change', () => {
  let db: TestDb;
  let app: Express;
  const bundle = `console.log(${JSON.stringify('Rotaloom '.repeat(4000))});`;
  const bundleName = '_expo/static/js/web/entry-0f3c5a9e2b7d4c1a8e6f0b3d5a7c9e1f.js';

  beforeAll(async () => {
    const webDir = mkdtempSync(path.join(os.tmpdir(), 'rotaloom-web-'));
    mkdirSync(path.join(webDir, '_expo/static/js/web'), { recursive: true });
    writeFileSync(path.join(webDir, 'index.html'), `<!doctype html><html><body>${'<div></div>'.repeat(200)}<script src="/${bundleName}"></script></body></html>`);
    writeFileSync(path.join(webDir, bundleName), bundle);
    writeFileSync(path.join(webDir, 'favicon.ico'), 'icon');
    db = await createTestDb({ ROTALOOM_WEB_DIR: webDir });
    app = makeApp(db).app;
  });
  afterAll(async () => {
    await db.drop();
  });

  it('gzips the bundle and lets browsers keep a hashed file for a year (RFC 9111 max-age, immutable)', async () => {
    const server = await rawServer(app);
    const res = await server.get(`/${bundleName}`, 'gzip');
    server.close();
    expect(res.status).toBe(200);
    expect(res.headers['content-encoding']).toBe('gzip');
    expect(res.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    const raw = res.body;
    expect(raw.length).toBeLessThan(bundle.length / 10);
    expect(gunzipSync(raw).toString()).toBe(bundle);
  });

  it('revalidates HTML and unhashed files on each use', async () => {
    const html = await request(app).get('/rosters/12').set('Accept-Encoding', 'gzip');
    expect(html.status).toBe(200);
    expect(html.headers['cache-control']).toBe('no-cache');
    expect(html.headers['content-encoding']).toBe('gzip');
    const icon = await request(app).get('/favicon.ico');
    expect(icon.headers['cache-control']).toBe('no-cache');
  });

  it('compresses API JSON too', async () => {
    const res = await request(app).get('/api/auth/providers').set('Accept-Encoding', 'gzip');
    expect(res.status).toBe(200);
    // small answers go out as they are (the middleware's 1 kB threshold); the header says it may vary
    expect(res.headers.vary).toMatch(/Accept-Encoding/i);
  });
});
