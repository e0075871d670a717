import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import type { Sequelize } from 'sequelize';
import { Person } from '../../server/db/models';
import { openDemoDatabase } from './helpers/demo-db';
import { Roster } from '../../server/rosters/models';
import { LedgerSettingsRow } from '../../server/swaps/models';
import { createPattern, createRoster } from '../../server/rosters/repository';
import { publishDirectly, seatsOf } from '../server/staff/publish-helper';
import { launch, openPage, PHONE, screenshot, signIn, WIDE } from './helpers/browser';

const ROSTER = 'Willowmere House, ledger fortnight (browser test)';

/**
 * The ledger's charts (react-native-gifted-charts on react-native-svg) and two runs side by side,
 * at 390×844 and 1280×800. A fortnight across Easter 2027 is published twice straight in the
 * database (two runs that differ in a few seats), as the staff browser test publishes.
 */
describe('ledger charts and run comparison', () => {
  let browser: Browser;
  let sequelize: Sequelize;
  let workspaceId: number;
  let rosterId: number;

  beforeAll(async () => {
    browser = await launch();
    ({ sequelize, workspaceId } = await openDemoDatabase());
    await Roster.destroy({ where: { workspaceId, name: ROSTER } });
    // England's public holidays (date-holidays): Good Friday 26 and Easter Monday 29 March 2027 fall in the fortnight.
    if (!(await LedgerSettingsRow.findOne({ where: { workspaceId } }))) await LedgerSettingsRow.create({ workspaceId, region: 'GB-ENG' });
    rosterId = (await createRoster(workspaceId, { name: ROSTER, periodStart: '2027-03-22', periodEnd: '2027-04-04', timeZone: 'Europe/London' })).id;
    const all = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'];
    await createPattern(workspaceId, rosterId, { label: 'early', weekdays: all, startTime: '07:00', endTime: '15:00', seats: [{ skillId: null, count: 1 }] });
    await createPattern(workspaceId, rosterId, { label: 'night', weekdays: all, startTime: '21:00', endTime: '07:00', seats: [{ skillId: null, count: 1 }] });
    const people = await Person.findAll({ where: { workspaceId, archivedAt: null }, order: [['id', 'ASC']], limit: 6 });
    const seats = await seatsOf(workspaceId, rosterId);
    const fill = (shift: number) =>
      seats.map((s) => {
        const day = seats.filter((x) => x.label === s.label).indexOf(s);
        return { seatId: s.seatId, personId: s.label === 'early' ? people[(day + shift) % 3].id : people[3 + (day < 9 ? 0 : (day % 3))].id };
      });
    await publishDirectly(workspaceId, rosterId, fill(0));
    await publishDirectly(workspaceId, rosterId, fill(1));
  });
  afterAll(async () => {
    await Roster.destroy({ where: { workspaceId, name: ROSTER } });
    await LedgerSettingsRow.destroy({ where: { workspaceId } });
    await sequelize.close();
    await browser.close();
  });

  for (const [size, viewport] of [['phone', PHONE], ['wide', WIDE]] as const) {
    it(`shows the ledger as charts and compares two runs (${size})`, { timeout: 180_000 }, async () => {
      const { page, problems, close } = await openPage(browser, viewport);
      await signIn(page);
      await page.waitForLoadState('networkidle');
      await page.goto('/ledger');
      await page.getByRole('heading', { name: 'Ledger', exact: true }).waitFor();
      const people = page.getByTestId('ledger-people-chart');
      await people.waitFor();
      await people.scrollIntoViewIfNeeded();
      await screenshot(page, `ledger-${size}-01-people`);
      // gifted-charts draws axes and rules in SVG (react-native-svg on the web) and the bars as views.
      expect(await people.locator('svg').count()).toBeGreaterThan(0);
      // The bars are laid out a frame after the chart's box appears (a phone run once measured 20 px).
      await page.waitForFunction((el) => el!.getBoundingClientRect().height > 150, await people.elementHandle(), { timeout: 10_000 });
      expect(await people.getAttribute('aria-label')).toMatch(/nights/);
      expect(await people.getAttribute('aria-label')).toMatch(/[1-9] holiday/);
      await page.getByTestId('ledger-hours-chart').scrollIntoViewIfNeeded();
      expect(await page.getByTestId('ledger-hours-chart').locator('svg').count()).toBeGreaterThan(0);
      await screenshot(page, `ledger-${size}-02-hours`);
      await page.getByTestId('ledger-periods').scrollIntoViewIfNeeded();
      await page.getByTestId('ledger-periods-chart').locator('svg').first().waitFor();
      await screenshot(page, `ledger-${size}-03-periods`);

      await page.waitForLoadState('networkidle');
      await page.goto(`/compare?roster=${rosterId}`);
      await page.getByRole('heading', { name: 'Compare two runs' }).waitFor();
      const result = page.getByTestId('compare-result');
      await result.waitFor();
      await page.getByTestId('compare-seats').getByText(/^Seats that changed \(\d+\)$/).waitFor();
      expect(await page.getByTestId('compare-seats').getByText(/→/).count()).toBeGreaterThan(0);
      await page.getByTestId('compare-people').getByText(/more in B/).first().waitFor();
      await screenshot(page, `compare-${size}-01-seats`);
      await page.getByTestId('compare-terms').scrollIntoViewIfNeeded();
      await screenshot(page, `compare-${size}-02-terms`);
      expect(problems).toEqual([]);
      await close();
    });
  }
});
