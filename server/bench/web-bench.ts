/**
 * `npm run bench:web`: the first screens on a slow phone, in Chromium (playwright-core) at
 * 390×844. Profiles: "slow phone" — 1.6 Mbit/s down, 750 kbit/s up, 150 ms round trip, CPU 4×
 * slower (Chrome DevTools Protocol: Network.emulateNetworkConditions, Emulation.setCPUThrottlingRate,
 * the network conditions also on the service worker, which fetches on its own) — and unthrottled.
 *
 * Starts its own throwaway MariaDB and Redis, seeds the Willowmere demo, solves and publishes its
 * roster, builds the web app (or serves --web-dir DIR as it is), then loads: the landing page,
 * signing in, a coordinator's roster result and a staff member's "my shifts", first visit and
 * repeat visit. Prints per page: first contentful paint, time until the page's own content is
 * shown and, when later, until it takes input (the landing page is HTML before its code hydrates
 * it), bytes over the network and JavaScript bytes, then the landing page's exact bytes and the
 * load average. `--gzip-only` makes the pages ask for gzip alone, as a browser does over plain HTTP
 * to another host. A benchmark that prints figures, not a test.
 */
import os from 'node:os';
import path from 'node:path';
import { mkdtempSync, rmSync } from 'node:fs';
import type { Server } from 'node:http';
import type { Sequelize } from 'sequelize';
import { chromium, type Browser, type BrowserContext, type CDPSession, type Page } from 'playwright-core';
import { readEnv } from '../env';
import { createApp } from '../app';
import { freePort, startMariaDb } from '../bootstrap/mariadb';
import { prepareDatabase } from '../bootstrap/database';
import { buildWebIfChanged } from '../bootstrap/web-build';
import { RunWorker } from '../runs/worker';
import { closeQueues } from '../queue/queues';
import { startRedis } from '../bootstrap/redis';
import { Roster } from '../rosters/models';
import { DEMO_PASSWORD } from '../db/seed';

const rootDir = path.resolve(import.meta.dirname, '..', '..');
const VIEWPORT = { width: 390, height: 844 };

interface Profile {
  name: string;
  network?: { latency: number; downloadThroughput: number; uploadThroughput: number };
  cpuRate: number;
}

const PROFILES: Profile[] = [
  { name: 'slow phone', network: { latency: 150, downloadThroughput: 1_600_000 / 8, uploadThroughput: 750_000 / 8 }, cpuRate: 4 },
  { name: 'unthrottled', cpuRate: 1 },
];

/** What each page shows once it is really there (not the boot screen). */
const SHOWN = {
  landing: '[data-testid="sign-in-submit"]',
  signedIn: 'nav[aria-label="Main"], [role="navigation"][aria-label="Main"]',
  result: '[data-testid="result-summary"]',
  myShifts: '[data-testid="next-shifts"]',
};

interface Row {
  profile: string;
  page: string;
  visit: string;
  fcpMs: number | null;
  shownMs: number;
  /** When the page takes input, if later than shown: the landing page's HTML is drawn before its code hydrates it. */
  usableMs: number | null;
  bytes: number;
  jsBytes: number;
}

const argValue = (name: string) => {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 ? process.argv[i + 1] : undefined;
};

/** Counts bytes that crossed the network for one page and its service worker. */
class Traffic {
  private byRequest = new Map<string, { script: boolean; fromCache: boolean }>();
  bytes = 0;
  jsBytes = 0;

  listen(on: (event: string, handler: (params: Record<string, unknown>) => void) => void): void {
    on('Network.responseReceived', (p) => {
      const response = p.response as { mimeType: string; fromServiceWorker?: boolean; fromDiskCache?: boolean; fromPrefetchCache?: boolean };
      this.byRequest.set(p.requestId as string, {
        script: p.type === 'Script' || /javascript/.test(response.mimeType),
        fromCache: Boolean(response.fromServiceWorker || response.fromDiskCache || response.fromPrefetchCache),
      });
    });
    on('Network.loadingFinished', (p) => {
      const seen = this.byRequest.get(p.requestId as string);
      if (!seen || seen.fromCache) return;
      const n = Number(p.encodedDataLength) || 0;
      this.bytes += n;
      if (seen.script) this.jsBytes += n;
    });
  }

  reset(): void {
    this.bytes = 0;
    this.jsBytes = 0;
  }
}

/**
 * The service worker fetches outside the page, so DevTools' page throttling does not slow it: the
 * same conditions are sent to every service-worker target (through the browser's own session).
 */
async function throttleServiceWorkers(browser: Browser, profile: Profile, traffic: Traffic): Promise<() => Promise<void>> {
  const session = await browser.newBrowserCDPSession();
  const handlers = new Map<string, Array<(p: Record<string, unknown>) => void>>();
  let nextId = 1;
  const attached = new Set<string>();
  const sendTo = (sessionId: string, method: string, params: object) =>
    session.send('Target.sendMessageToTarget', { sessionId, message: JSON.stringify({ id: nextId++, method, params }) });
  session.on('Target.receivedMessageFromTarget', (e: { message: string }) => {
    const msg = JSON.parse(e.message) as { method?: string; params?: Record<string, unknown> };
    if (msg.method) for (const h of handlers.get(msg.method) ?? []) h(msg.params ?? {});
  });
  traffic.listen((event, handler) => handlers.set(event, [...(handlers.get(event) ?? []), handler]));
  const attach = async (info: { targetId: string; type: string }) => {
    if (info.type !== 'service_worker' || attached.has(info.targetId)) return;
    attached.add(info.targetId);
    const { sessionId } = await session.send('Target.attachToTarget', { targetId: info.targetId, flatten: false });
    await sendTo(sessionId, 'Network.enable', {});
    if (profile.network) await sendTo(sessionId, 'Network.emulateNetworkConditions', { offline: false, ...profile.network });
  };
  session.on('Target.targetCreated', (e: { targetInfo: { targetId: string; type: string } }) => void attach(e.targetInfo).catch(() => {}));
  await session.send('Target.setDiscoverTargets', { discover: true });
  const { targetInfos } = await session.send('Target.getTargets');
  for (const t of targetInfos) await attach(t).catch(() => {});
  return () => session.detach();
}

async function preparePage(context: BrowserContext, profile: Profile, traffic: Traffic): Promise<{ page: Page; cdp: CDPSession }> {
  const page = await context.newPage();
  const cdp = await context.newCDPSession(page);
  await cdp.send('Network.enable');
  traffic.listen((event, handler) => cdp.on(event as 'Network.loadingFinished', handler as never));
  if (profile.network) await cdp.send('Network.emulateNetworkConditions', { offline: false, ...profile.network });
  await cdp.send('Emulation.setCPUThrottlingRate', { rate: profile.cpuRate });
  // --gzip-only: a browser that does not ask for Brotli (Chromium asks only HTTPS sites and localhost).
  if (process.argv.includes('--gzip-only')) await cdp.send('Network.setExtraHTTPHeaders', { headers: { 'Accept-Encoding': 'gzip, deflate' } });
  return { page, cdp };
}

/**
 * Waits until the selector is on screen and outside anything marked aria-disabled (the landing
 * form before hydration), and answers the page's own clock (ms since navigation start) at both:
 * when it was first drawn and when it first took input.
 */
async function shownAt(page: Page, selector: string, timeoutMs = 120_000): Promise<{ shown: number; usable: number }> {
  const handle = await page.waitForFunction(
    (sel) => {
      const el = document.querySelector(sel);
      if (!el) return false;
      const box = el.getBoundingClientRect();
      if (!(box.width > 0 && box.height > 0)) return false;
      const now = performance.now();
      const seen = ((window as unknown as { __benchShown?: Record<string, number> }).__benchShown ??= {});
      seen[sel] ??= now;
      return el.closest('[aria-disabled="true"]') ? false : { shown: seen[sel], usable: now };
    },
    selector,
    { timeout: timeoutMs, polling: 'raf' },
  ).catch(async (err: unknown) => {
    const shot = path.join(os.tmpdir(), `rotaloom-web-bench-${Date.now()}.png`);
    await page.screenshot({ path: shot }).catch(() => {});
    throw new Error(`${page.url()}: ${selector} not shown (screenshot ${shot}): ${err instanceof Error ? err.message : String(err)}`);
  });
  return (await handle.jsonValue()) as { shown: number; usable: number };
}

async function fcp(page: Page): Promise<number | null> {
  return page.evaluate(() => performance.getEntriesByName('first-contentful-paint')[0]?.startTime ?? null);
}

/** A navigation measured from its start; traffic counted until the network has been quiet. */
async function visit(page: Page, traffic: Traffic, url: string, selector: string): Promise<Omit<Row, 'profile' | 'page' | 'visit'>> {
  traffic.reset();
  await page.goto(url, { waitUntil: 'commit' });
  const { shown, usable } = await shownAt(page, selector);
  await page.waitForLoadState('networkidle').catch(() => {});
  return { fcpMs: await fcp(page), shownMs: shown, usableMs: usable > shown ? usable : null, bytes: traffic.bytes, jsBytes: traffic.jsBytes };
}

/** Signing in from the landing page, measured from the click to the signed-in shell (no navigation, so no paint entry). */
async function signInMeasured(page: Page, traffic: Traffic, email: string): Promise<Omit<Row, 'profile' | 'page' | 'visit'>> {
  await shownAt(page, SHOWN.landing);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  traffic.reset();
  const clicked = await page.evaluate(() => performance.now());
  await page.getByTestId('sign-in-submit').click();
  const shownMs = (await shownAt(page, SHOWN.signedIn)).shown - clicked;
  await page.waitForLoadState('networkidle').catch(() => {});
  return { fcpMs: null, shownMs, usableMs: null, bytes: traffic.bytes, jsBytes: traffic.jsBytes };
}

/**
 * A settled page, so the service worker (registered after load once someone is signed in) has
 * installed before a repeat visit. A signed-out landing page registers none.
 */
async function settle(page: Page): Promise<void> {
  await page.waitForLoadState('networkidle').catch(() => {});
  await page.evaluate(async () => {
    if (!('serviceWorker' in navigator) || !(await navigator.serviceWorker.getRegistration())) return;
    const registration = await Promise.race([navigator.serviceWorker.ready, new Promise((r) => setTimeout(r, 15_000))]);
    void registration;
  });
}

async function runProfile(browser: Browser, base: string, profile: Profile, rosterId: number): Promise<Row[]> {
  const rows: Row[] = [];
  const add = (pageName: string, visitName: string, r: Omit<Row, 'profile' | 'page' | 'visit'>) => rows.push({ profile: profile.name, page: pageName, visit: visitName, ...r });

  // A coordinator: the landing page twice, signing in, then the roster result twice.
  {
    const context = await browser.newContext({ viewport: VIEWPORT, baseURL: base });
    const traffic = new Traffic();
    const stopSw = await throttleServiceWorkers(browser, profile, traffic);
    const { page } = await preparePage(context, profile, traffic);
    add('landing', 'first', await visit(page, traffic, '/', SHOWN.landing));
    await settle(page);
    add('landing', 'repeat', await visit(page, traffic, '/', SHOWN.landing));
    add('sign-in → home', 'first', await signInMeasured(page, traffic, 'coordinator@willowmere.example'));
    add('roster result', 'first', await visit(page, traffic, `/rosters/${rosterId}?section=result`, SHOWN.result));
    await settle(page);
    add('roster result', 'repeat', await visit(page, traffic, `/rosters/${rosterId}?section=result`, SHOWN.result));
    await stopSw();
    await context.close();
  }
  // A staff member: signs in (not measured), then "my shifts" twice.
  {
    const context = await browser.newContext({ viewport: VIEWPORT, baseURL: base });
    const traffic = new Traffic();
    const stopSw = await throttleServiceWorkers(browser, profile, traffic);
    const { page } = await preparePage(context, profile, traffic);
    await page.goto('/');
    await shownAt(page, SHOWN.landing);
    await signInMeasured(page, traffic, 'staff@willowmere.example');
    add('my shifts', 'first', await visit(page, traffic, '/my-shifts', SHOWN.myShifts));
    await settle(page);
    add('my shifts', 'repeat', await visit(page, traffic, '/my-shifts', SHOWN.myShifts));
    await stopSw();
    await context.close();
  }
  return rows;
}

const kib = (n: number) => `${(n / 1024).toFixed(0)} KiB`;
const sec = (ms: number | null) => (ms === null ? '–' : `${(ms / 1000).toFixed(2)} s`);

function printTable(rows: Row[]): void {
  const head = ['profile', 'page', 'visit', 'first paint', 'shown', 'usable', 'transferred', 'of it JS'];
  const body = rows.map((r) => [r.profile, r.page, r.visit, sec(r.fcpMs), sec(r.shownMs), r.usableMs === null ? '=' : sec(r.usableMs), kib(r.bytes), kib(r.jsBytes)]);
  const widths = head.map((h, i) => Math.max(h.length, ...body.map((b) => b[i].length)));
  const line = (cells: string[]) => `| ${cells.map((c, i) => c.padEnd(widths[i])).join(' | ')} |`;
  console.log(line(head));
  console.log(`|${widths.map((w) => '-'.repeat(w + 2)).join('|')}|`);
  for (const b of body) console.log(line(b));
}

async function main(): Promise<number> {
  const tmp = mkdtempSync(path.join(os.tmpdir(), 'rotaloom-web-bench-'));
  const cleanups: Array<() => Promise<unknown>> = [];
  try {
    // Not under .data/: express.static will not serve from a folder whose name starts with a dot.
    // --web-dir is served as it is; ROTALOOM_WEB_DIR (as for `npm test`) is built into when the sources changed.
    const webDir = path.resolve(argValue('web-dir') ?? process.env.ROTALOOM_WEB_DIR ?? path.join(os.tmpdir(), 'rotaloom-bench-web'));
    if (!argValue('web-dir')) console.log(`web app ${await buildWebIfChanged(rootDir, webDir)} (${webDir})`);
    const dbPort = await freePort();
    const db = await startMariaDb({ dataDir: path.join(tmp, 'mariadb'), port: dbPort, log: () => {} });
    cleanups.push(() => db.stop());
    const redis = await startRedis({ dataDir: path.join(tmp, 'redis'), port: await freePort(), log: () => {} });
    cleanups.push(() => redis.stop());
    const env = readEnv({ ...process.env, NODE_ENV: 'test', ROTALOOM_DB_PORT: String(dbPort), ROTALOOM_DB_HOST: '127.0.0.1', ROTALOOM_DB_NAME: 'rotaloom_web_bench', ROTALOOM_REDIS_URL: redis.url, ROTALOOM_WEB_DIR: webDir });
    const sequelize = await prepareDatabase(env.db, () => {});
    cleanups.push(() => sequelize.close());
    cleanups.push(() => closeQueues(sequelize));
    const server: Server = await new Promise((resolve) => {
      const s = createApp({ env, sequelize }).listen(0, '127.0.0.1', () => resolve(s));
    });
    cleanups.push(() => new Promise((resolve) => server.close(resolve)));
    const base = `http://127.0.0.1:${(server.address() as { port: number }).port}`;

    const rosterId = await solveAndPublish(base, sequelize);
    const browser = await chromium.launch({
      executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--no-first-run', '--disable-component-update', '--disable-sync'],
    });
    cleanups.push(() => browser.close());
    const rows: Row[] = [];
    // CPU-bound times move with the machine's load by a factor of two or more; the bytes do not.
    const loadBefore = os.loadavg()[0];
    for (const profile of PROFILES) rows.push(...(await runProfile(browser, base, profile, rosterId)));
    console.log(`\nweb app from ${webDir}; Chromium at ${VIEWPORT.width}×${VIEWPORT.height}${process.argv.includes('--gzip-only') ? ', asking for gzip, not Brotli' : ''}; ${os.cpus().length} cores shared with whatever else runs`);
    console.log(`load average (1 min): ${loadBefore.toFixed(1)} when the pages started, ${os.loadavg()[0].toFixed(1)} at the end`);
    printTable(rows);
    // The target counts bytes of JavaScript (1 KB = 1,000 bytes), so these are exact.
    for (const r of rows.filter((row) => row.page === 'landing' && row.visit === 'first')) {
      console.log(`${r.profile}, landing, first visit: ${r.jsBytes.toLocaleString('en')} bytes of JavaScript, ${r.bytes.toLocaleString('en')} bytes in all (headers included)`);
    }
    return 0;
  } finally {
    for (const c of cleanups.reverse()) await c().catch((err) => console.error(err));
    rmSync(tmp, { recursive: true, force: true });
  }
}

/** The demo roster solved (5 s) and published through the API, so the result and "my shifts" have content. */
async function solveAndPublish(base: string, sequelize: Sequelize): Promise<number> {
  const api = async (method: string, url: string, cookie: string, body?: unknown) => {
    const res = await fetch(`${base}${url}`, { method, headers: { accept: 'application/json', 'content-type': 'application/json', 'x-rotaloom-csrf': '1', cookie }, body: body === undefined ? undefined : JSON.stringify(body) });
    const text = await res.text();
    if (!res.ok) throw new Error(`${method} ${url}: ${res.status} ${text.slice(0, 300)}`);
    return { json: text ? (JSON.parse(text) as Record<string, unknown>) : {}, cookie: res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ') };
  };
  const signedIn = await api('POST', '/api/auth/sign-in', '', { email: 'coordinator@willowmere.example', password: DEMO_PASSWORD });
  const cookie = signedIn.cookie;
  const roster = (await Roster.findOne({ order: [['id', 'ASC']] }))!;
  const run = await api('POST', `/api/rosters/${roster.id}/runs`, cookie, { timeLimitSeconds: 5, seed: 1 });
  const worker = new RunWorker(sequelize, { name: 'web-bench' });
  await worker.tick();
  await worker.stop();
  const fresh = (await Roster.findByPk(roster.id))!;
  await api('POST', `/api/rosters/${roster.id}/publish`, cookie, { runId: run.json.id, version: fresh.version });
  return roster.id;
}

main().then(
  (code) => process.exit(code),
  (err) => {
    console.error(`bench:web failed: ${err instanceof Error ? err.stack : String(err)}`);
    process.exit(1);
  },
);
