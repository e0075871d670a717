import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll } from 'vitest';

export const PHONE = { width: 390, height: 844 } as const;
export const WIDE = { width: 1280, height: 800 } as const;

/** The web build's own files (code chunks, images, fonts, icons), never API calls. */
const STATIC_FILE = /^\/(_expo\/static|assets|icons)\//;

export function baseUrl(): string {
  const url = process.env.ROTALOOM_E2E_URL;
  if (!url) throw new Error('Browser tests need a running app: run them through `npm test` (it sets ROTALOOM_E2E_URL)');
  return url;
}

export async function launch(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-quic', '--no-first-run', '--disable-component-update', '--disable-sync'],
  });
}

/** One Chromium for the enclosing describe block: launched before its tests, closed after them. */
export function useBrowser(): () => Browser {
  let browser: Browser | undefined;
  beforeAll(async () => {
    browser = await launch();
  });
  afterAll(async () => {
    await browser?.close();
  });
  return () => {
    if (!browser) throw new Error('useBrowser: the browser is only there inside the tests of its describe block');
    return browser;
  };
}

export interface WatchedPage {
  context: BrowserContext;
  page: Page;
  /** Console errors, page errors and failed or 4xx/5xx requests seen so far, as readable lines. */
  problems: string[];
  close(): Promise<void>;
}

/**
 * A page that records everything that went wrong, so a test can end with
 * `expect(problems).toEqual([])`: any unexpected console error or failed request fails it.
 */
export async function openPage(browser: Browser, viewport: { width: number; height: number }, allow: RegExp[] = []): Promise<WatchedPage> {
  const context = await browser.newContext({ viewport, deviceScaleFactor: 1, baseURL: baseUrl() });
  const page = await context.newPage();
  const problems: string[] = [];
  const allowed = (line: string) => allow.some((re) => re.test(line));
  const note = (line: string) => {
    if (!allowed(line)) problems.push(line);
  };
  page.on('console', (msg) => {
    if (msg.type() === 'error') note(`console: ${msg.text()}`);
  });
  page.on('pageerror', (err) => note(`page error: ${err.message}`));
  page.on('requestfailed', (req) => {
    // A run's event stream (server-sent events) ends by the page closing it: that shows as aborted.
    if (/\/api\/runs\/\d+\/events$/.test(new URL(req.url()).pathname) && /ERR_ABORTED/.test(req.failure()?.errorText ?? '')) return;
    // A navigation cancels the code, images and icon still loading for the page it leaves (each
    // screen's code is its own file since async routes): the browser moving on, not a failure.
    if (req.failure()?.errorText === 'net::ERR_ABORTED' && req.method() === 'GET' && STATIC_FILE.test(new URL(req.url()).pathname)) return;
    note(`request failed: ${req.method()} ${req.url()} ${req.failure()?.errorText ?? ''}`);
  });
  page.on('response', (res) => {
    if (res.status() >= 400) note(`HTTP ${res.status()}: ${res.request().method()} ${res.url()}`);
  });
  return { context, page, problems, close: () => context.close() };
}

const shotDir = path.resolve(process.env.ROTALOOM_SCREENSHOT_DIR ?? '.data/screenshots');

export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(shotDir, { recursive: true });
  const file = path.join(shotDir, `${name}.png`);
  await page.screenshot({ path: file, fullPage: false });
  return file;
}

/** The demo's password (server/db/seed.ts) for every Willowmere account. */
export const DEMO_PASSWORD = 'willowmere-demo';

/** Signs in through the landing page's form as a person would, and waits for the signed-in shell. */
export async function signIn(page: Page, email = 'coordinator@willowmere.example'): Promise<void> {
  await page.goto('/');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByTestId('sign-in-submit').click();
  await page.getByRole('navigation', { name: 'Main' }).waitFor();
  // The first screen's own requests finish before a test moves on, as a person waits for the page:
  // a goto while they are still out cancels them, and openPage counts a cancelled API call. The
  // service worker, registered once someone is signed in, now competes with them for the line.
  await page.waitForLoadState('networkidle');
}

/**
 * Opens a roster from the list, reopening it first when a test that ran earlier left it published,
 * so it can be solved again.
 */
export async function openRosterForSolving(page: Page, roster: string): Promise<void> {
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Rosters' }).click();
  await page.getByRole('link', { name: `Open roster ${roster}` }).click();
  await page.getByRole('heading', { name: roster }).waitFor();
  if (await page.getByText('Published and frozen').first().isVisible()) {
    await page.getByTestId('section-publish').click();
    await page.getByTestId('publish-reopen').click();
    await page.getByTestId('publish-go').waitFor();
  }
}

/** Starts a run of `seconds` from the Solve section and opens its result once the worker has finished it. */
export async function solveAndOpenResult(page: Page, seconds = 3): Promise<void> {
  await page.getByTestId('section-solve').click();
  await page.getByTestId('solve-seconds').fill(String(seconds));
  await page.getByTestId('solve-start').click();
  await page.getByTestId('run-show-result').waitFor({ timeout: 120_000 });
  await page.getByTestId('run-show-result').click();
  await page.getByTestId('result-summary').waitFor();
}
