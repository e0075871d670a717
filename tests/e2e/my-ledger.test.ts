import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import type { Sequelize } from 'sequelize';
import { Op } from 'sequelize';
import { Person } from '../../server/db/models';
import { openDemoDatabase } from './helpers/demo-db';
import { AssignmentRow, Roster, SeatRow, ShiftRow, WishRow } from '../../server/rosters/models';
import { HolidayRow, LedgerSettingsRow } from '../../server/swaps/models';
import { createPattern, createRoster } from '../../server/rosters/repository';
import type { MyLedgerAnswer } from '../../shared/api/ledger';
import { publishDirectly, seatsOf } from '../server/staff/publish-helper';
import { directCounts, publicHolidays, type Direct } from '../server/ledger/direct-count';
import { launch, openPage, PHONE, screenshot, signIn, WIDE } from './helpers/browser';

const FORTNIGHT = 'Willowmere House, my ledger fortnight (browser test)';
const PAIR_WEEK = 'Willowmere House, my ledger pair week (browser test)';
const num = (v: number) => String(Math.round(v * 10) / 10);
/** Hours as the screen writes them, the unit after a no-break space. */
const h = (v: number) => `${num(v)}\u00a0h`;

/**
 * A staff member's own ledger on a phone (390×844) and a wide screen (1280×800). Hattie (the
 * demo's staff account) works a fortnight across England's Early May bank holiday (Monday 3 May
 * 2027, date-holidays GB-ENG) with three colleagues, then a week with one colleague only. Both are
 * published straight in the database, as the other browser tests publish. The figures on screen
 * are checked against counts made here from the stored rows (tests/server/ledger/direct-count.ts)
 * and against GET /api/me/ledger; the pair week's team average must stay hidden.
 */
describe('my ledger in the browser', () => {
  let browser: Browser;
  let sequelize: Sequelize;
  let workspaceId: number;
  let hattie: Person;
  let fortnight: number;
  let pairWeek: number;
  let expected: Map<number, Direct>;
  let settingsBefore: { region: string | null } | null;

  beforeAll(async () => {
    browser = await launch();
    ({ sequelize, workspaceId } = await openDemoDatabase());
    hattie = (await Person.findOne({ where: { workspaceId, name: 'Hattie Lowther' } }))!;
    await Roster.destroy({ where: { workspaceId, name: [FORTNIGHT, PAIR_WEEK] } });
    const settings = await LedgerSettingsRow.findOne({ where: { workspaceId } });
    settingsBefore = settings ? { region: settings.region ?? null } : null;
    if (settings) await settings.update({ region: 'GB-ENG' });
    else await LedgerSettingsRow.create({ workspaceId, region: 'GB-ENG' });

    const [p1, p2, p3] = await Person.findAll({ where: { workspaceId, archivedAt: null, id: { [Op.ne]: hattie.id } }, order: [['id', 'ASC']], limit: 3 });
    const all = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'];
    fortnight = (await createRoster(workspaceId, { name: FORTNIGHT, periodStart: '2027-04-26', periodEnd: '2027-05-09', timeZone: 'Europe/London' })).id;
    await createPattern(workspaceId, fortnight, { label: 'early', weekdays: all, startTime: '07:00', endTime: '15:00', seats: [{ skillId: null, count: 1 }] });
    await createPattern(workspaceId, fortnight, { label: 'night', weekdays: all, startTime: '21:00', endTime: '07:00', seats: [{ skillId: null, count: 1 }] });
    const seats = await seatsOf(workspaceId, fortnight);
    const nth = (s: (typeof seats)[number]) => seats.filter((x) => x.label === s.label).indexOf(s);
    // Earlies: Hattie on even days, p1 on odd ones; nights: p2 the first week, Hattie Mon 3 and Tue 4 May, then p3.
    await publishDirectly(
      workspaceId,
      fortnight,
      seats.map((s) => ({ seatId: s.seatId, personId: s.label === 'early' ? (nth(s) % 2 === 0 ? hattie.id : p1.id) : nth(s) < 7 ? p2.id : nth(s) < 9 ? hattie.id : p3.id })),
    );
    for (const [personId, date, kind] of [[hattie.id, '2027-04-26', 'prefer'], [hattie.id, '2027-04-27', 'avoid'], [hattie.id, '2027-05-03', 'avoid'], [p1.id, '2027-05-03', 'cannot'], [p2.id, '2027-05-01', 'prefer']] as const) {
      await WishRow.create({ workspaceId, rosterId: fortnight, personId, date, kind });
    }
    pairWeek = (await createRoster(workspaceId, { name: PAIR_WEEK, periodStart: '2027-05-10', periodEnd: '2027-05-16', timeZone: 'Europe/London' })).id;
    await createPattern(workspaceId, pairWeek, { label: 'early', weekdays: all, startTime: '07:00', endTime: '15:00', seats: [{ skillId: null, count: 1 }] });
    const weekSeats = await seatsOf(workspaceId, pairWeek);
    await publishDirectly(workspaceId, pairWeek, weekSeats.map((s, i) => ({ seatId: s.seatId, personId: i % 2 === 0 ? hattie.id : p1.id })));

    const roster = (await Roster.findByPk(fortnight))!;
    const rows = await AssignmentRow.findAll({ where: { runId: roster.publishedRunId! } });
    const seatRows = await SeatRow.findAll({ where: { id: rows.map((r) => r.seatId) } });
    const entered = await HolidayRow.findAll({ where: { workspaceId, date: { [Op.between]: ['2027-04-26', '2027-05-09'] } } });
    const people = await Person.findAll({ where: { workspaceId } });
    expected = directCounts({
      start: roster.periodStart,
      end: roster.periodEnd,
      timeZone: roster.timeZone,
      shifts: (await ShiftRow.findAll({ where: { rosterId: fortnight } })).map((s) => ({ id: s.id, startsLocal: s.startsLocal, endsLocal: s.endsLocal })),
      rows: rows.map((r) => ({ personId: r.personId, shiftId: seatRows.find((x) => x.id === r.seatId)!.shiftId })),
      wishes: (await WishRow.findAll({ where: { rosterId: fortnight } })).map((w) => ({ personId: w.personId, date: w.date ?? null, shiftId: w.shiftId ?? null, kind: w.kind })),
      holidays: new Set([...publicHolidays('GB', 'ENG', 2027), ...entered.map((h) => h.date)]),
      contractWeekly: new Map(people.map((p) => [p.id, Number(p.contractedHours) || 0])),
      swapPeople: [],
    });
  });
  afterAll(async () => {
    await Roster.destroy({ where: { workspaceId, name: [FORTNIGHT, PAIR_WEEK] } });
    if (settingsBefore) await LedgerSettingsRow.update({ region: settingsBefore.region }, { where: { workspaceId } });
    else await LedgerSettingsRow.destroy({ where: { workspaceId } });
    await sequelize.close();
    await browser.close();
  });

  /** Opens My ledger from the navigation, through "More" on a phone. */
  async function openMyLedger(page: Page, phone: boolean) {
    if (phone) {
      await page.getByTestId('more-tab').click();
      await page.getByTestId('more-sheet').getByRole('menuitem', { name: 'My ledger' }).click();
    } else {
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'My ledger' }).click();
    }
    await page.getByRole('heading', { name: 'My ledger', exact: true }).waitFor();
  }

  for (const [size, viewport] of [['phone', PHONE], ['wide', WIDE]] as const) {
    it(`shows Hattie her own counts beside the team's average (${size})`, { timeout: 180_000 }, async () => {
      const { page, problems, close } = await openPage(browser, viewport);
      await signIn(page, 'staff@willowmere.example');
      await page.waitForLoadState('networkidle');
      await openMyLedger(page, size === 'phone');
      await page.getByTestId('my-ledger-compare-chart').waitFor();
      const api = (await (await page.request.get('/api/me/ledger')).json()) as MyLedgerAnswer;

      // Something of every kind to count for Hattie, so a screen of zeros cannot pass.
      const mine = expected.get(hattie.id)!;
      for (const k of ['nights', 'weekendShifts', 'weekendsWorked', 'holidayShifts', 'wishesHonoured', 'wishesRefused'] as const) expect(mine[k], k).toBeGreaterThan(0);
      // The API's line for the fortnight is what the stored rows say.
      const apiFortnight = api.me!.byPeriod.find((b) => b.rosterId === fortnight)!;
      for (const [k, v] of Object.entries(mine)) expect(apiFortnight[k as keyof Direct], k).toBeCloseTo(v, 2);
      // The team's average over the fortnight's four people, from the same rows.
      const four = [...expected.values()];
      expect(four).toHaveLength(4);
      const avg = (k: keyof Direct) => four.reduce((n, c) => n + c[k], 0) / 4;
      const row = page.getByTestId(`my-ledger-period-${fortnight}`);
      await row.scrollIntoViewIfNeeded();
      const text = (await row.textContent())!;
      expect(text).toContain(`You: ${mine.shifts} shifts · ${mine.nights} nights · ${mine.weekendShifts} weekend · ${mine.holidayShifts} holiday · ${mine.unpopularShifts} unpopular · wishes ${mine.wishesHonoured} kept, ${mine.wishesRefused} not · ${h(mine.hours)} of ${h(mine.contractHours)}`);
      expect(text).toContain(`Team average: ${num(avg('shifts'))} shifts · ${num(avg('nights'))} nights · ${num(avg('weekendShifts'))} weekend · ${num(avg('holidayShifts'))} holiday`);
      // Only Hattie and one colleague on the pair week: no average there, on screen or in the answer.
      expect(await page.getByTestId(`my-ledger-period-${pairWeek}`).textContent()).toMatch(/Team average: not shown \(fewer than 3 people counted\)/);
      expect(api.team.byPeriod.find((t) => t.rosterId === pairWeek)).toEqual({ rosterId: pairWeek, people: 2, average: null });
      await screenshot(page, `ledger-staff-${size}-04-rosters`);

      // The table and the chart's words give the API's totals (every published roster Hattie is on).
      const totals = page.getByTestId('my-ledger-table');
      await totals.scrollIntoViewIfNeeded();
      for (const k of ['shifts', 'nights', 'weekendShifts', 'weekendsWorked', 'holidayShifts', 'wishesHonoured'] as const) {
        const cells = await page.getByTestId(`my-ledger-total-${k}`).getByRole('cell').allTextContents();
        expect(cells, k).toEqual([num(api.me!.totals[k]), num(api.team.average[k])]);
      }
      expect(await page.getByTestId('my-ledger-total-hours').getByRole('cell').first().textContent()).toBe(h(api.me!.totals.hours));
      const chart = page.getByTestId('my-ledger-compare-chart');
      expect(await chart.getAttribute('aria-label')).toContain(`Nights ${num(api.team.mine.nights)} against ${num(api.team.average.nights)}`);
      // gifted-charts draws axes and rules in SVG (react-native-svg on the web) and the bars as views.
      expect(await chart.locator('svg').count()).toBeGreaterThan(0);
      // The bars are laid out a frame after the chart's box appears (a wide run once measured 51 px).
      await page.waitForFunction((el) => el!.getBoundingClientRect().height > 150, await chart.elementHandle(), { timeout: 10_000 });
      expect((await chart.boundingBox())!.width).toBeLessThanOrEqual(viewport.width);
      await page.getByTestId('my-ledger-compare').getByRole('heading', { name: 'You and the team' }).scrollIntoViewIfNeeded();
      await screenshot(page, `ledger-staff-${size}-01-compare`);

      await page.getByTestId('my-ledger-periods').getByRole('heading', { name: 'Period by period' }).scrollIntoViewIfNeeded();
      await page.getByTestId('my-ledger-periods-chart').locator('svg').first().waitFor();
      await screenshot(page, `ledger-staff-${size}-02-periods`);
      await page.getByTestId('my-ledger-whose').getByRole('radio', { name: 'Team average' }).click();
      expect(await page.getByTestId('my-ledger-periods-chart').getAttribute('aria-label')).toBe('Team average, period by period');
      await page.getByTestId('my-ledger-hours').scrollIntoViewIfNeeded();
      expect(await page.getByTestId('my-ledger-hours-chart').locator('svg').count()).toBeGreaterThan(0);
      expect(await page.getByTestId('my-ledger-hours-chart').getAttribute('aria-label')).toContain(`26/4 ${num(mine.hours)} of ${num(mine.contractHours)} h`);
      await screenshot(page, `ledger-staff-${size}-03-hours`);

      // No colleague's name reaches the page (the fortnight's three worked beside Hattie).
      const body = (await page.locator('body').textContent())!;
      const colleagues = await Person.findAll({ where: { id: [...expected.keys()].filter((id) => id !== hattie.id) } });
      for (const c of colleagues) expect(body).not.toContain(c.name);
      expect(problems).toEqual([]);
      await close();
    });
  }

  it('says in words when nothing is published and when the ledger cannot be reached (phone)', { timeout: 120_000 }, async () => {
    // Routed on the context, which also sees requests the service worker passes on.
    const { context, page, problems, close } = await openPage(browser, PHONE, [/\/api\/me\/ledger/, /ERR_INTERNET_DISCONNECTED/]);
    const zeros = { shifts: 0, hours: 0, nights: 0, weekendShifts: 0, weekendsWorked: 0, holidayShifts: 0, unpopularShifts: 0, wishesHonoured: 0, wishesRefused: 0, contractHours: 0, swaps: 0 };
    await signIn(page, 'staff@willowmere.example');
    await page.waitForLoadState('networkidle');
    // The server's answer for a workspace with nothing published (tests/server/ledger/my-ledger.test.ts checks it).
    await context.route('**/api/me/ledger', (route) => route.fulfill({ json: { from: null, to: null, holidays: [], periods: [], me: null, teamSize: 0, minColleagues: 2, team: { byPeriod: [], rosterIds: [], average: zeros, mine: zeros } } }));
    await openMyLedger(page, true);
    await page.getByText(/^Nothing is published yet\. When a coordinator publishes a roster/).waitFor();
    await screenshot(page, 'ledger-staff-phone-05-empty');
    await context.unroute('**/api/me/ledger');
    await context.route('**/api/me/ledger', (route) => route.abort('internetdisconnected'));
    await page.goto('/home');
    await page.waitForLoadState('networkidle');
    await openMyLedger(page, true);
    await page.getByTestId('my-ledger-error').getByText('Your ledger could not be loaded. Rotaloom could not be reached. Check your connection and try again.').waitFor({ timeout: 30_000 });
    await screenshot(page, 'ledger-staff-phone-06-error');
    await context.unroute('**/api/me/ledger');
    await page.getByRole('button', { name: 'Try again' }).click();
    await page.getByTestId('my-ledger-compare-chart').waitFor();
    expect(problems).toEqual([]);
    await close();
  });
});
