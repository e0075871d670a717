import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openPage, PHONE, screenshot, useBrowser, WIDE } from './helpers/browser';
import { mailLink } from './helpers/sign-up';


const run = Date.now().toString(36);
let n = 0;
const unique = (who: string) => `${who}.${run}.${++n}@example.test`;

/** Every section the menu offers, including those a phone keeps behind "More". */
async function navLabels(page: Page): Promise<string[]> {
  const nav = page.getByRole('navigation', { name: 'Main' });
  await nav.waitFor();
  const labels = (await nav.getByRole('link').allTextContents()).map((t) => t.trim());
  const more = page.getByTestId('more-tab');
  if (await more.count()) {
    await more.click();
    const sheet = page.getByTestId('more-sheet');
    await sheet.waitFor();
    labels.push(...(await sheet.getByRole('menuitem').allTextContents()).map((t) => t.trim()));
    await more.click();
  }
  return labels;
}

/** Opens a section from the menu, through "More" on a phone when needed. */
async function openSection(page: Page, label: string): Promise<void> {
  const link = page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: label });
  if (await link.count()) return link.click();
  await page.getByTestId('more-tab').click();
  await page.getByTestId('more-sheet').getByRole('menuitem', { name: label }).click();
}

describe.each([
  ['phone', PHONE],
  ['wide', WIDE],
] as const)('accounts and roles at %s size', (label, viewport) => {
  const browser = useBrowser();

  it('signs up (making a workspace, as its admin), signs out, and signs back in with the password', async () => {
    const { page, problems, close } = await openPage(browser(), viewport);
    const email = unique('founder');
    await page.goto('/');
    await page.getByTestId('sign-up-link').click();
    await page.getByRole('heading', { name: 'Make a workspace' }).waitFor();
    await page.getByTestId('sign-up-name').fill('Maren Fairweather');
    await page.getByTestId('sign-up-email').fill(email);
    await page.getByTestId('sign-up-password').fill('short');
    await page.getByTestId('sign-up-workspace').fill('Gullhaven Hospice');
    await page.getByTestId('sign-up-submit').click();
    await page.getByText('Use at least 10 characters').waitFor();
    await page.getByTestId('sign-up-password').fill('a long enough passphrase');
    await page.getByTestId('sign-up-submit').click();
    // Nothing is made until the e-mailed link is opened.
    await page.getByRole('heading', { name: 'Check your e-mail' }).waitFor();
    await page.getByText(`We sent a message to ${email}`, { exact: false }).waitFor();
    await screenshot(page, `sign-up-check-email-${label}`);
    await mailLink(page, email, '/finish-sign-up');
    await page.goto('/dev/mail');
    const mail = page.locator('article', { hasText: email }).first();
    await mail.getByText('Finish signing up to Rotaloom').waitFor();
    await mail.getByRole('link', { name: /\/finish-sign-up\?token=/ }).click();
    await page.getByRole('heading', { name: 'Hello, Maren' }).waitFor();
    await page.getByText('You are signed in to Gullhaven Hospice as admin.').waitFor();
    expect(await navLabels(page)).toEqual(expect.arrayContaining(['Overview', 'Members', 'Account']));
    await screenshot(page, `signed-up-admin-${label}`);

    await page.getByRole('button', { name: 'Sign out' }).first().click();
    await page.getByRole('heading', { name: /Rosters your team can trust/ }).waitFor();
    await page.getByLabel('E-mail').fill(email);
    await page.getByLabel('Password').fill('a long enough passphrase');
    await page.getByTestId('sign-in-submit').click();
    await page.getByRole('heading', { name: 'Hello, Maren' }).waitFor();
    expect(problems).toEqual([]);
    await close();
  });

  it('answers a taken address as a new one and mails its owner; a link opened elsewhere asks for the password, and works once', async () => {
    // The used link's preview and finish answer 410 on purpose.
    const { page, problems, close } = await openPage(browser(), viewport, [/HTTP 410: (GET|POST) .*\/api\/auth\/sign-up\/(preview|finish)/, /status of 410/]);
    const signUp = async (email: string) => {
      await page.goto('/sign-up');
      await page.getByTestId('sign-up-name').fill('Ansel Pike');
      await page.getByTestId('sign-up-email').fill(email);
      await page.getByTestId('sign-up-password').fill('kestrel quarry lantern');
      await page.getByTestId('sign-up-workspace').fill('Tollbridge Surgery');
      await page.getByTestId('sign-up-submit').click();
      await page.getByRole('heading', { name: 'Check your e-mail' }).waitFor();
      return page.getByTestId('sign-up-check-email').innerText();
    };
    const taken = 'coordinator@willowmere.example';
    const fresh = unique('elsewhere');
    const forTaken = await signUp(taken);
    const forFresh = await signUp(fresh);
    expect(forTaken.replace(taken, '<address>')).toBe(forFresh.replace(fresh, '<address>'));
    await mailLink(page, fresh, '/finish-sign-up');
    await mailLink(page, taken, '/forgot-password');
    await page.goto('/dev/mail');
    await page.locator('article', { hasText: taken }).first().getByText('Someone tried to sign up to Rotaloom with your address').waitFor();
    const href = await page.locator('article', { hasText: fresh }).first().getByRole('link', { name: /\/finish-sign-up\?token=/ }).first().getAttribute('href');
    const path = new URL(href!).pathname + new URL(href!).search;

    // Another browser (no cookie from the sign-up): the password chosen is asked for.
    const other = await openPage(browser(), viewport);
    await other.page.goto(path);
    await other.page.getByRole('heading', { name: 'Finish signing up' }).waitFor();
    await other.page.getByText(`this makes the workspace Tollbridge Surgery for ${fresh}`, { exact: false }).waitFor();
    await screenshot(other.page, `finish-sign-up-password-${label}`);
    await other.page.getByTestId('finish-sign-up-password').fill('kestrel quarry lantern');
    await other.page.getByTestId('finish-sign-up-submit').click();
    await other.page.getByRole('heading', { name: 'Hello, Ansel' }).waitFor();
    await other.page.getByText('You are signed in to Tollbridge Surgery as admin.').waitFor();
    expect(other.problems).toEqual([]);
    await other.close();

    // The same link again: used, in words.
    await page.goto(path);
    await page.getByTestId('finish-sign-up-problem').getByText(/already used/).waitFor();
    await screenshot(page, `finish-sign-up-used-${label}`);
    expect(problems).toEqual([]);
    await close();
  });

  it('signs in with Google through the fake, invites a coordinator, who accepts from the mailbox and sees a coordinator menu', async () => {
    const admin = await openPage(browser(), viewport);
    const adminEmail = unique('google.admin');
    await admin.page.goto('/');
    await admin.page.getByTestId('google-sign-in').click();
    await admin.page.getByRole('heading', { name: 'Choose an account' }).waitFor();
    await admin.page.getByLabel('Name').fill('Tobias Wrenfield');
    await admin.page.getByLabel('E-mail').fill(adminEmail);
    await admin.page.getByRole('button', { name: 'Continue' }).click();
    await admin.page.getByRole('heading', { name: 'Hello, Tobias' }).waitFor();
    await admin.page.getByText("You are signed in to Tobias Wrenfield's team as admin.").waitFor();

    await openSection(admin.page, 'Members');
    await admin.page.getByRole('heading', { name: /Members of/ }).waitFor();
    const coordinatorEmail = unique('coordinator');
    await admin.page.getByTestId('invite-email').fill(coordinatorEmail);
    await admin.page.getByTestId('invite-role').getByRole('radio', { name: 'Coordinator' }).click();
    await admin.page.getByTestId('invite-submit').click();
    await admin.page.getByText(`Invitation sent to ${coordinatorEmail}.`).waitFor();
    await admin.page.getByTestId(`invitation-${coordinatorEmail}`).waitFor();
    await screenshot(admin.page, `members-admin-${label}`);
    expect(admin.problems).toEqual([]);

    // The invitee, in a browser of their own, opens the mail on the dev mail page and follows the link.
    const invitee = await openPage(browser(), viewport);
    await invitee.page.goto('/dev/mail');
    const mail = invitee.page.locator('article', { hasText: coordinatorEmail }).first();
    await mail.getByText(/invited you to Tobias Wrenfield's team/).waitFor();
    await mail.getByRole('link', { name: /\/invitation\?token=/ }).click();
    await invitee.page.getByRole('heading', { name: "Join Tobias Wrenfield's team" }).waitFor();
    await invitee.page.getByText(`Tobias Wrenfield invited ${coordinatorEmail}`, { exact: false }).waitFor();
    await invitee.page.getByTestId('invitation-name').fill('Priya Lansdowne');
    await invitee.page.getByTestId('invitation-password').fill('coordinator passphrase');
    await invitee.page.getByTestId('accept-invitation').click();
    await invitee.page.getByRole('heading', { name: 'Hello, Priya' }).waitFor();
    await invitee.page.getByText("You are signed in to Tobias Wrenfield's team as coordinator.").waitFor();
    const menu = await navLabels(invitee.page);
    expect(menu).toContain('Account');
    expect(menu).not.toContain('Members');
    await screenshot(invitee.page, `coordinator-${label}`);
    expect(invitee.problems).toEqual([]);

    // The admin's members list now shows the coordinator, and the invitation is gone.
    await admin.page.reload();
    await admin.page.getByTestId(`member-${coordinatorEmail}`).waitFor();
    expect(await admin.page.getByTestId(`invitation-${coordinatorEmail}`).count()).toBe(0);
    expect(admin.problems).toEqual([]);
    await admin.close();
    await invitee.close();
  });

  it('Google sign-in as the demo staff member joins their password account and shows a staff menu', async () => {
    const { page, problems, close } = await openPage(browser(), viewport);
    await page.goto('/');
    await page.getByTestId('google-sign-in').click();
    await page.getByRole('heading', { name: 'Choose an account' }).waitFor();
    // The fake's test account with the same verified address as the seeded staff@willowmere.example.
    await page.getByRole('button', { name: /staff@willowmere\.example/ }).click();
    await page.getByRole('heading', { name: 'Hello, Hattie' }).waitFor();
    await page.getByText('You are signed in to Willowmere House as staff.').waitFor();
    const menu = await navLabels(page);
    expect(menu).toContain('Account');
    for (const hidden of ['Members', 'Rosters', 'People', 'Plan & billing']) expect(menu).not.toContain(hidden);
    await openSection(page, 'Account');
    await page.getByText('Google sign-in is linked to this account.').waitFor();
    await screenshot(page, `staff-account-${label}`);
    expect(problems).toEqual([]);
    await close();
  });

  it('the same invitation link cannot be used twice', async () => {
    const { page, problems, close } = await openPage(browser(), viewport, [/HTTP 410: GET .*\/api\/invitations\/preview/, /status of 410/]);
    await page.goto('/dev/mail');
    const link = await page.locator('article', { hasText: 'invited you to' }).first().getByRole('link', { name: /\/invitation\?token=/ }).first().getAttribute('href');
    await page.goto(new URL(link!).pathname + new URL(link!).search);
    await page.getByText(/already used/).waitFor();
    expect(problems).toEqual([]);
    await close();
  });
});
