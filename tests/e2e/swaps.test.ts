import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import bcrypt from 'bcryptjs';
import type { Browser, Page } from 'playwright-core';
import type { Sequelize } from 'sequelize';
import { Membership, Person, User } from '../../server/db/models';
import { openDemoDatabase } from './helpers/demo-db';
import { AssignmentRow, Roster } from '../../server/rosters/models';
import { OfferRow, SwapRow } from '../../server/swaps/models';
import { createPattern, createRoster } from '../../server/rosters/repository';
import { publishDirectly, seatsOf } from '../server/staff/publish-helper';
import { DEMO_PASSWORD, launch, openPage, PHONE, screenshot, signIn, WIDE } from './helpers/browser';

const ROSTER = 'Willowmere House, swap week (browser test)';
const COLLEAGUE_EMAIL = 'swap-colleague@willowmere.example';

/**
 * Two staff members swap a published shift and a coordinator approves it with one tap; then an
 * open seat is offered and taken. Hattie (the demo's staff account) is on a phone (390×844);
 * Rosalind (an account this test links to her) and the coordinator are on a wide screen
 * (1280×800), with the coordinator's screens also shot on a phone. Published straight in the
 * database, as the staff browser test does: week of 8 February 2027 (GMT).
 */
describe('swaps and open shifts in the browser', () => {
  let browser: Browser;
  let sequelize: Sequelize;
  let workspaceId: number;
  let rosterId: number;
  let hattie: Person;
  let rosalind: Person;
  let seat: (label: string, day: string) => number;

  beforeAll(async () => {
    browser = await launch();
    ({ sequelize, workspaceId } = await openDemoDatabase());
    hattie = (await Person.findOne({ where: { workspaceId, name: 'Hattie Lowther' } }))!;
    rosalind = (await Person.findOne({ where: { workspaceId, name: 'Rosalind Fairhurst' } }))!;
    const old = await Roster.findAll({ where: { workspaceId, name: ROSTER } });
    await SwapRow.destroy({ where: { workspaceId, rosterId: old.map((r) => r.id) } });
    await OfferRow.destroy({ where: { workspaceId, rosterId: old.map((r) => r.id) } });
    await Roster.destroy({ where: { workspaceId, name: ROSTER } });
    let user = await User.findOne({ where: { email: COLLEAGUE_EMAIL } });
    if (!user) {
      user = await User.create({ email: COLLEAGUE_EMAIL, displayName: 'Rosalind Fairhurst', passwordHash: await bcrypt.hash(DEMO_PASSWORD, 10), emailVerified: true });
      await Membership.create({ workspaceId, userId: user.id, role: 'staff' });
    }
    if (rosalind.userId !== user.id) await Person.update({ userId: user.id }, { where: { id: rosalind.id } });
    const roster = await createRoster(workspaceId, { name: ROSTER, periodStart: '2027-02-08', periodEnd: '2027-02-14', timeZone: 'Europe/London' });
    rosterId = roster.id;
    const weekdays = ['mon', 'tue', 'wed', 'thu', 'fri'];
    await createPattern(workspaceId, rosterId, { label: 'early', weekdays, startTime: '07:00', endTime: '15:00', seats: [{ skillId: null, count: 1 }] });
    await createPattern(workspaceId, rosterId, { label: 'late', weekdays, startTime: '15:00', endTime: '23:00', seats: [{ skillId: null, count: 1 }] });
    const seats = await seatsOf(workspaceId, rosterId);
    seat = (label, day) => seats.find((s) => s.label === label && s.startsLocal.startsWith(day))!.seatId;
    // Hattie: earlies Mon–Tue; Rosalind: the late on Tuesday and the earlies Thu–Fri. Friday's late is left open.
    await publishDirectly(workspaceId, rosterId, [
      { seatId: seat('early', '2027-02-08'), personId: hattie.id },
      { seatId: seat('early', '2027-02-09'), personId: hattie.id },
      { seatId: seat('late', '2027-02-09'), personId: rosalind.id },
      { seatId: seat('early', '2027-02-11'), personId: rosalind.id },
      { seatId: seat('early', '2027-02-12'), personId: rosalind.id },
    ]);
  });
  afterAll(async () => {
    const rows = await Roster.findAll({ where: { workspaceId, name: ROSTER } });
    await SwapRow.destroy({ where: { workspaceId, rosterId: rows.map((r) => r.id) } });
    await OfferRow.destroy({ where: { workspaceId, rosterId: rows.map((r) => r.id) } });
    await Roster.destroy({ where: { workspaceId, name: ROSTER } });
    await sequelize.close();
    await browser.close();
  });

  const held = async (seatId: number) => {
    const roster = (await Roster.findByPk(rosterId))!;
    return (await AssignmentRow.findOne({ where: { runId: roster.publishedRunId!, seatId } }))?.personId ?? null;
  };
  const chip = (page: Page, group: string, name: string | RegExp) => page.getByTestId(group).getByRole('radio', { name });

  it('Hattie proposes on her phone (a swap breaking the daily rest is refused in words), Rosalind accepts, the coordinator approves', { timeout: 240_000 }, async () => {
    const phone = await openPage(browser, PHONE);
    await signIn(phone.page, 'staff@willowmere.example');
    await phone.page.goto('/swaps');
    await phone.page.getByRole('heading', { name: 'Swaps', exact: true }).waitFor();
    await chip(phone.page, 'swap-mine', /^Mon 8 Feb · early/).click();
    await chip(phone.page, 'swap-colleague', 'Rosalind Fairhurst').click();
    // Her Tuesday late straight after Hattie's Tuesday early: no rest between them.
    await chip(phone.page, 'swap-theirs', /^Tue 9 Feb · late/).click();
    await phone.page.getByTestId('swap-check').getByText(/Cannot be proposed\. This change would break a hard rule/).waitFor();
    expect(await phone.page.getByTestId('swap-propose').isDisabled()).toBe(true);
    await phone.page.getByTestId('swap-check').scrollIntoViewIfNeeded();
    await screenshot(phone.page, 'swaps-phone-01-refused');
    await chip(phone.page, 'swap-theirs', /^Thu 11 Feb · early/).click();
    await phone.page.getByText(/Cannot be proposed/).waitFor({ state: 'detached' });
    await phone.page.getByTestId('swap-check').getByText(/The roster's score (stays|goes)/).waitFor();
    await screenshot(phone.page, 'swaps-phone-02a-checked');
    await phone.page.getByTestId('swap-propose').click();
    await phone.page.getByText('Sent to Rosalind Fairhurst.', { exact: false }).waitFor();
    await phone.page.getByTestId('swaps-mine').getByText('Waiting for the colleague').waitFor();
    await screenshot(phone.page, 'swaps-phone-02-proposed');

    const wide = await openPage(browser, WIDE);
    await signIn(wide.page, COLLEAGUE_EMAIL);
    await wide.page.goto('/swaps');
    const asked = wide.page.getByTestId('swaps-asked');
    await asked.getByText(/Hattie Lowther gives you Mon 8 Feb · early/).waitFor();
    await screenshot(wide.page, 'swaps-wide-03-asked');
    await asked.getByRole('button', { name: 'Accept' }).click();
    await wide.page.getByTestId('swaps-mine').getByText('Waiting for the coordinator').waitFor();

    const coordinator = await openPage(browser, WIDE);
    await signIn(coordinator.page);
    await coordinator.page.goto('/changes');
    const waiting = coordinator.page.getByTestId('swaps-waiting');
    await waiting.getByText('Hattie Lowther and Rosalind Fairhurst swap').waitFor();
    await screenshot(coordinator.page, 'swaps-wide-04-to-approve');
    const coordPhone = await openPage(browser, PHONE);
    await signIn(coordPhone.page);
    await coordPhone.page.goto('/changes');
    await coordPhone.page.getByTestId('swaps-waiting').getByText('Hattie Lowther and Rosalind Fairhurst swap').waitFor();
    await screenshot(coordPhone.page, 'swaps-phone-04-to-approve');
    await waiting.getByRole('button', { name: 'Approve' }).click();
    await coordinator.page.getByText(/Approved\. The published roster is updated; 2 e-mails sent/).waitFor();
    await screenshot(coordinator.page, 'swaps-wide-05-approved');
    expect(await held(seat('early', '2027-02-08'))).toBe(rosalind.id);
    expect(await held(seat('early', '2027-02-11'))).toBe(hattie.id);

    await phone.page.waitForLoadState('networkidle');
    await phone.page.reload();
    await phone.page.getByTestId('swaps-mine').getByText('Approved').waitFor();
    for (const p of [phone, wide, coordinator, coordPhone]) {
      expect(p.problems).toEqual([]);
      await p.close();
    }
  });

  it('the coordinator offers the open Friday late; Hattie takes it on her phone; approved, the published roster holds her', { timeout: 240_000 }, async () => {
    const coordinator = await openPage(browser, WIDE);
    await signIn(coordinator.page);
    await coordinator.page.goto('/changes');
    const open = coordinator.page.getByTestId('open-shifts');
    const rosterChip = open.getByRole('radio', { name: ROSTER });
    if (await rosterChip.count()) await rosterChip.click();
    const card = coordinator.page.getByTestId(`open-seat-${seat('late', '2027-02-12')}`);
    await card.waitFor();
    // Rosalind works Friday's early: the late would leave her no daily rest.
    await card.getByText(/^Not eligible: Rosalind Fairhurst: /).waitFor();
    await card.scrollIntoViewIfNeeded();
    await screenshot(coordinator.page, 'offers-wide-01-open-seat');
    await card.getByRole('button', { name: /^Offer to \d+ eligible$/ }).click();
    await card.getByText('On offer').waitFor();

    const phone = await openPage(browser, PHONE);
    await signIn(phone.page, 'staff@willowmere.example');
    await phone.page.goto('/swaps');
    const offers = phone.page.getByTestId('offers-for-me');
    await offers.getByText(/^Fri 12 Feb · late 15:00–23:00/).waitFor();
    await offers.scrollIntoViewIfNeeded();
    await screenshot(phone.page, 'offers-phone-02-offered');
    await offers.getByRole('button', { name: 'Take this shift' }).click();
    await offers.getByText('Waiting for the coordinator').waitFor();

    await coordinator.page.waitForLoadState('networkidle');
    await coordinator.page.reload();
    const decide = coordinator.page.getByTestId('open-shifts').getByText(/^Hattie Lowther takes Fri 12 Feb · late/);
    if (!(await decide.count())) {
      const again = coordinator.page.getByTestId('open-shifts').getByRole('radio', { name: ROSTER });
      if (await again.count()) await again.click();
    }
    await decide.waitFor();
    await coordinator.page.getByTestId('open-shifts').getByRole('button', { name: 'Approve' }).click();
    await coordinator.page.getByTestId('open-shifts').getByText(/^Hattie Lowther takes/).waitFor({ state: 'detached' });
    await screenshot(coordinator.page, 'offers-wide-03-after-approve');
    await coordinator.page.getByText(/Approved\. The published roster is updated; 1 e-mail sent/).waitFor();
    await screenshot(coordinator.page, 'offers-wide-03-approved');
    expect(await held(seat('late', '2027-02-12'))).toBe(hattie.id);
    for (const p of [phone, coordinator]) {
      expect(p.problems).toEqual([]);
      await p.close();
    }
  });
});
