import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import type { Sequelize } from 'sequelize';
import { Person } from '../../server/db/models';
import { openDemoDatabase } from './helpers/demo-db';
import { Roster } from '../../server/rosters/models';
import { createPattern, createRoster } from '../../server/rosters/repository';
import { publishDirectly, seatsOf } from '../server/staff/publish-helper';
import { launch, openPage, PHONE, screenshot, signIn, WIDE } from './helpers/browser';

const ROSTER = 'Willowmere House, offline week (browser test)';
const OFFLINE_CACHE = 'rotaloom-mine';
/** How a read fails with the network cut off (Chromium's error names, the client's words). */
const OFFLINE_FAILURE = /ERR_INTERNET_DISCONNECTED|net::ERR_FAILED|Failed to load resource|Failed to fetch|could not be reached/;

/** What the page's service worker keeps for reading offline: the URLs in its personal cache. */
const keptUrls = (page: Page) =>
  page.evaluate(async (name) => ((await caches.has(name)) ? (await (await caches.open(name)).keys()).map((r) => new URL(r.url).pathname) : []), OFFLINE_CACHE);

async function serviceWorkerInControl(page: Page): Promise<void> {
  await page.evaluate(() => navigator.serviceWorker.ready);
  // clientsClaim: the worker takes the open page over once it has activated
  await page.waitForFunction(() => navigator.serviceWorker.controller !== null, null, { timeout: 30_000 });
}

/**
 * The installable app for staff: Chromium's own manifest parser and installability check on the
 * manifest, then a staff member reads "my shifts" with the network cut off (Workbox service
 * worker), sees when the copy was saved, and nobody signing in after them on the same browser
 * reads those shifts. The roster published for her here (March 2027) makes sure she has shifts.
 */
describe('an app staff can install and read offline', () => {
  let browser: Browser;
  let sequelize: Sequelize;
  let workspaceId: number;

  beforeAll(async () => {
    browser = await launch();
    ({ sequelize, workspaceId } = await openDemoDatabase());
    const hattie = (await Person.findOne({ where: { workspaceId, name: 'Hattie Lowther' } }))!;
    await Roster.destroy({ where: { workspaceId, name: ROSTER } });
    const roster = await createRoster(workspaceId, { name: ROSTER, periodStart: '2027-03-01', periodEnd: '2027-03-07', timeZone: 'Europe/London' });
    await createPattern(workspaceId, roster.id, { label: 'early', weekdays: ['mon', 'wed', 'fri'], startTime: '07:00', endTime: '15:00', seats: [{ skillId: null, count: 1 }] });
    const seats = await seatsOf(workspaceId, roster.id);
    await publishDirectly(workspaceId, roster.id, seats.map((s) => ({ seatId: s.seatId, personId: hattie.id })));
  });
  afterAll(async () => {
    await Roster.destroy({ where: { workspaceId, name: ROSTER } });
    await sequelize.close();
    await browser.close();
  });

  it('asks for my shifts beside the app’s code and the screen takes that answer (one request, not two)', { timeout: 120_000 }, async () => {
    const { page, problems, close } = await openPage(browser, PHONE);
    await signIn(page, 'staff@willowmere.example');
    await page.goto('/my-shifts');
    await page.getByTestId('next-shifts').waitFor();
    await page.waitForLoadState('networkidle');
    const asked: Array<{ path: string; type: string }> = [];
    page.on('request', (r) => asked.push({ path: new URL(r.url()).pathname, type: r.resourceType() }));
    await page.reload();
    await page.getByTestId('next-shifts').waitFor();
    await page.waitForLoadState('networkidle');
    // The shell's first script preloads it (server/bootstrap/web-finish.ts); a preload the page's
    // fetch could not use (other URL, credentials or mode) would show as a second request.
    expect(asked.filter((a) => a.path === '/api/me/shifts').length).toBe(1);
    expect(asked.filter((a) => a.path === '/api/auth/session').length).toBe(1);
    expect(problems).toEqual([]);
    await close();
  });

  for (const [name, viewport] of [['phone', PHONE], ['wide', WIDE]] as const) {
    it(`has a manifest Chromium reads without errors and finds installable once someone signs in (${name})`, { timeout: 120_000 }, async () => {
      const { page, problems, close } = await openPage(browser, viewport);
      await page.goto('/');
      await page.getByTestId('sign-in-submit').waitFor();
      await page.waitForLoadState('networkidle');
      // A signed-out visitor's landing page installs no worker (hooks/offline/service-worker.web.ts): nothing to keep for nobody.
      expect(await page.evaluate(async () => (await navigator.serviceWorker.getRegistrations()).length)).toBe(0);
      await signIn(page, 'staff@willowmere.example');
      await serviceWorkerInControl(page);
      const cdp = await page.context().newCDPSession(page);
      const manifest = (await cdp.send('Page.getAppManifest')) as { url: string; errors: Array<{ message: string }>; data?: string };
      expect(new URL(manifest.url).pathname).toBe('/manifest.webmanifest');
      expect(manifest.errors).toEqual([]);
      const parsed = JSON.parse(manifest.data ?? '{}') as { display: string; theme_color: string };
      expect(parsed.display).toBe('standalone');
      const installability = (await cdp.send('Page.getInstallabilityErrors')) as { installabilityErrors: Array<{ errorId: string }> };
      // Every check Chromium makes before offering to install passes; 'in-incognito' is about the
      // test's browser profile (contexts are incognito-like), not about the app.
      expect(installability.installabilityErrors.map((e) => e.errorId).filter((id) => id !== 'in-incognito')).toEqual([]);
      const res = await page.request.get('/manifest.webmanifest');
      expect(res.headers()['content-type']).toMatch(/^application\/manifest\+json/);
      await screenshot(page, `offline-app-${name}-01-signed-in`);
      expect(problems).toEqual([]);
      await close();
    });

    it(`reads my shifts with the network cut off, says since when, and forgets them at sign-out (${name})`, { timeout: 240_000 }, async () => {
      const { context, page, problems, close } = await openPage(browser, viewport);
      const cards = () => page.getByTestId('next-shifts').locator('[data-testid^="shift-"]').evaluateAll((els) => els.map((e) => e.getAttribute('aria-label')));
      await signIn(page, 'staff@willowmere.example');
      await page.goto('/my-shifts');
      await page.getByTestId('next-shifts').waitFor();
      await serviceWorkerInControl(page);
      // Now under the worker: this visit's answers are the ones it keeps.
      // Settled first: a reload cuts off whatever is still loading (the calendar's arrow images).
      await page.waitForLoadState('networkidle');
      const saved = page.waitForResponse((r) => new URL(r.url()).pathname === '/api/me/shifts' && r.status() === 200);
      await page.reload();
      await saved;
      await page.getByTestId('next-shifts').waitFor();
      const online = await cards();
      expect(online.length).toBeGreaterThan(0);
      await expect.poll(() => keptUrls(page), { timeout: 15_000 }).toEqual(expect.arrayContaining(['/api/auth/session', '/api/me/shifts']));
      const savedAt = await page.evaluate(async (name) => {
        const cache = await caches.open(name);
        const hit = (await cache.keys()).find((r) => new URL(r.url).pathname === '/api/me/shifts')!;
        return (await cache.match(hit))!.headers.get('x-rotaloom-saved-at');
      }, OFFLINE_CACHE);
      expect(savedAt).not.toBeNull();
      // HH:MM as Intl (ICU) reads the saved instant in the workspace's zone, not as our code does
      const hhmm = new Intl.DateTimeFormat('en-GB', { timeZone: 'Europe/London', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(new Date(savedAt!));

      // Cut off, the screen's other reads (the calendar feed) fail as they should: allowed only then.
      const before = problems.length;
      await page.waitForLoadState('networkidle');
      await context.setOffline(true);
      await page.reload();
      await page.getByText(`You are offline — showing shifts as of ${hhmm}`).waitFor({ timeout: 30_000 });
      await page.getByTestId('next-shifts').waitFor();
      expect(await cards()).toEqual(online);
      await screenshot(page, `offline-app-${name}-02-my-shifts-offline`);
      // What failed while cut off was network only, and nothing else went wrong.
      expect(problems.slice(before).filter((p) => !OFFLINE_FAILURE.test(p))).toEqual([]);
      problems.splice(before);

      await context.setOffline(false);
      await page.reload();
      await page.getByTestId('next-shifts').waitFor();
      await page.waitForLoadState('networkidle');
      expect(await page.getByText(/showing shifts as of/).count()).toBe(0);
      await page.getByRole('button', { name: 'Sign out' }).filter({ visible: true }).first().click();
      await page.getByTestId('sign-in-submit').waitFor();
      await expect.poll(() => keptUrls(page), { timeout: 10_000 }).toEqual([]);

      // The next person on this browser, cut off, gets no one else's shifts from the worker.
      await signIn(page, 'coordinator@willowmere.example');
      expect(await keptUrls(page)).not.toContain('/api/me/shifts');
      await page.waitForLoadState('networkidle');
      await context.setOffline(true);
      const before2 = problems.length;
      await page.goto('/my-shifts').catch(() => {});
      await page.getByRole('heading', { name: 'My shifts' }).or(page.getByText(/could not|cannot be reached|offline/i).first()).first().waitFor({ timeout: 30_000 });
      expect(await page.getByText('Hattie Lowther').count()).toBe(0);
      expect(await page.getByText(/showing shifts as of/).count()).toBe(0);
      await screenshot(page, `offline-app-${name}-03-next-person-offline`);
      expect(problems.slice(before2).filter((p) => !OFFLINE_FAILURE.test(p))).toEqual([]);
      problems.splice(before2);
      await context.setOffline(false);
      expect(problems).toEqual([]);
      await close();
    });
  }
});
