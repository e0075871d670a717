import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { DEMO_PASSWORD, openPage, PHONE, screenshot, useBrowser, WIDE } from './helpers/browser';
import { signUpThroughMail } from './helpers/sign-up';

const PASSWORD = 'a long enough test password';
const headers = { 'x-rotaloom-csrf': '1' };
// The payment service's published test card numbers, as the fake's checkout page takes them.
const SUCCESS_CARD = '4242 4242 4242 4242';
const DECLINED_CARD = '4000 0000 0000 0002';

/** Fills the fake's checkout form (its own page, served by fakes/stripe) and submits it. */
async function pay(page: Page, card: string) {
  await page.getByLabel('Card number').fill(card);
  await page.getByLabel('Expiry (MM/YY)').fill('12/34');
  await page.getByLabel('CVC').fill('123');
  await page.getByLabel('Name on card').fill('Marisol Quenby');
  await page.getByRole('button', { name: 'Start free trial' }).click();
}

describe.each([
  ['phone', PHONE],
  ['wide', WIDE],
] as const)('admin upgrades a new workspace at %s size', (label, viewport) => {
  const browser = useBrowser();

  it('hits the free limit, is declined with one card, upgrades with the other and sees the plan change', async () => {
    // Expected refusals: the 13th person (402 plan_limit) and the declined card on the checkout page (402).
    // (Chromium also logs each as "Failed to load resource … 402"; the URL-specific lines are what pin them down.)
    // And the one checkout tried while the payment service is unreachable (503).
    const { page, problems, close } = await openPage(browser(), viewport, [/HTTP 402: POST .*\/api\/people$/, /HTTP 402: POST .*\/pay\/cs_test_/, /HTTP 503: POST .*\/api\/billing\/checkout$/, /^console: Failed to load resource: the server responded with a status of (402|503)/]);
    // A new workspace, signed up through the API and the e-mailed link as its admin (the browser context keeps the session cookie).
    const email = `owner.${label}.${Date.now().toString(36)}@example.test`;
    await signUpThroughMail(page, { displayName: 'Marisol Quenby', email, password: PASSWORD, workspaceName: `Hazelmere Clinic ${label}`, timeZone: 'Europe/London' });
    for (let i = 1; i <= 12; i++) {
      const res = await page.request.post('/api/people', { data: { name: `Clinic Person ${i}`, contractedHours: 30, skillIds: [] }, headers });
      expect(res.status()).toBe(201);
    }

    // The 13th person, through the form: the server refuses and the screen offers the upgrade.
    await page.goto('/people/new');
    await page.getByTestId('person-name').fill('Clinic Person 13');
    await page.getByTestId('person-hours').fill('30');
    await page.getByTestId('person-save').click();
    const prompt = page.getByTestId('plan-limit-prompt');
    await prompt.waitFor();
    expect(await prompt.textContent()).toMatch(/allows 12 people, and this workspace has 12/);
    await screenshot(page, `billing-1-limit-${label}`);
    await page.getByTestId('plan-limit-upgrade').click();

    // Plan & billing: the free plan, full.
    await page.getByRole('heading', { name: 'Plan & billing' }).waitFor();
    await page.getByTestId('plan-name').getByText('Starter').waitFor();
    expect(await page.getByTestId('usage-people').getAttribute('aria-label')).toBe('People: 12 of 12');
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    await screenshot(page, `billing-2-free-${label}`);

    // The payment service unreachable: a message on screen, and the plan stays as it was.
    await setFakeOffline(true);
    await page.getByTestId('start-checkout').click();
    await page.getByText(/payment service could not be reached, so nothing was set up and nothing was charged/).waitFor({ timeout: 30_000 });
    await screenshot(page, `billing-2b-unreachable-${label}`);
    await setFakeOffline(false);

    // To the fake's checkout page; the declined card shows its message and nothing changes.
    await page.getByTestId('start-checkout').click();
    await page.waitForURL(/\/pay\/cs_test_/);
    await page.getByText('12 seats × £4.00').waitFor();
    await pay(page, DECLINED_CARD);
    await page.getByRole('alert').getByText('Your card was declined').waitFor();
    await screenshot(page, `billing-3-declined-${label}`);

    // The test card that succeeds: back on Plan & billing, the plan changes once the signed event has arrived.
    await pay(page, SUCCESS_CARD);
    await page.waitForURL(/\/billing\?checkout=done/);
    await page.getByTestId('plan-name').getByText('Team').waitFor({ timeout: 15_000 });
    await page.getByText('Free trial', { exact: true }).waitFor();
    await page.getByText(/£48\.00 a month for 12 seats once the free trial ends/).waitFor();
    expect(await page.getByTestId('usage-people').getAttribute('aria-label')).toBe('People: 12 of no limit');
    await page.getByTestId('invoices').getByText('Paid').first().waitFor();
    await screenshot(page, `billing-4-team-${label}`);

    // The limit is gone: the 13th person is added through the same form.
    await page.goto('/people/new');
    await page.getByTestId('person-name').fill('Clinic Person 13');
    await page.getByTestId('person-hours').fill('30');
    await page.getByTestId('person-save').click();
    await page.waitForURL((url) => url.pathname === '/people');
    await page.getByText('Clinic Person 13').first().waitFor();
    const people = (await (await page.request.get('/api/people')).json()) as { total: number };
    expect(people.total).toBe(13);

    expect(problems).toEqual([]);
    await close();
    // Sign-up, twelve people, two trips to the payment page: longer than the default on a shared two-core machine.
  }, 180_000);
});

/** Makes the payments fake drop API connections, as if the service were unreachable (a test control of the fake). */
async function setFakeOffline(on: boolean) {
  const res = await fetch(`${process.env.ROTALOOM_STRIPE_FAKE_URL}/_fake/offline`, { method: 'POST', body: new URLSearchParams({ on: on ? '1' : '0' }) });
  expect(res.status).toBe(200);
}

/** The fake's test controls (never part of the real service): move a subscription into its next period. */
async function renew(workspaceId: number, outcome: 'paid' | 'failed') {
  const fakeUrl = process.env.ROTALOOM_STRIPE_FAKE_URL;
  if (!fakeUrl) throw new Error('ROTALOOM_STRIPE_FAKE_URL is not set (npm test sets it)');
  const state = (await (await fetch(`${fakeUrl}/_fake/state`)).json()) as { subscriptions: Array<{ id: string; metadata: Record<string, string> }> };
  const sub = state.subscriptions.find((s) => s.metadata.workspace_id === String(workspaceId));
  if (!sub) throw new Error(`no subscription for workspace ${workspaceId} at the fake`);
  const res = await fetch(`${fakeUrl}/_fake/subscriptions/${sub.id}/renew`, { method: 'POST', body: new URLSearchParams({ outcome }) });
  expect(res.status).toBe(200);
}

describe('a paying workspace at phone size', () => {
  const browser = useBrowser();

  it('previews and confirms a seat change, shows the overdue banner, pays in the portal, and can stop at the period end', async () => {
    const { page, problems, close } = await openPage(browser(), PHONE);
    const email = `payer.${Date.now().toString(36)}@example.test`;
    const workspaceId = (await signUpThroughMail(page, { displayName: 'Oriel Fenwick', email, password: PASSWORD, workspaceName: 'Brackenfold Lab', timeZone: 'Europe/London' })).workspace.id;
    for (let i = 1; i <= 3; i++) expect((await page.request.post('/api/people', { data: { name: `Lab Person ${i}`, contractedHours: 30, skillIds: [] }, headers })).status()).toBe(201);

    await page.goto('/billing');
    await page.getByTestId('start-checkout').click();
    await page.waitForURL(/\/pay\/cs_test_/);
    await pay(page, SUCCESS_CARD);
    await page.getByText('Free trial', { exact: true }).waitFor({ timeout: 15_000 });
    // The trial ends and the first month is paid.
    await renew(workspaceId, 'paid');
    await page.reload();
    await page.getByText('Paid and current').waitFor();
    await page.getByText(/£12\.00 a month for 3 seats, renewing on/).waitFor();

    // One more person: the seat change waits for the admin, with the new monthly price shown first.
    expect((await page.request.post('/api/people', { data: { name: 'Lab Person 4', contractedHours: 30, skillIds: [] }, headers })).status()).toBe(201);
    await page.reload();
    const change = page.getByTestId('seat-change');
    await change.getByText('You have 4 people and pay for 3 seats.').waitFor();
    await change.getByText('£16.00', { exact: true }).waitFor();
    await change.getByText('Monthly price now').waitFor();
    await change.scrollIntoViewIfNeeded();
    await screenshot(page, 'billing-5-seat-preview-phone');
    await page.getByTestId('confirm-seats').click();
    await page.getByText(/£16\.00 a month for 4 seats/).waitFor();
    expect(await page.getByTestId('seat-change').count()).toBe(0);

    // The next renewal fails: the admin sees the banner on every page; data stays readable.
    await renew(workspaceId, 'failed');
    await page.goto('/home');
    const banner = page.getByTestId('past-due-banner');
    await banner.waitFor();
    // 4 seats × £4.00, plus the 4th seat for the period in which it was added (just begun, so ≈ £4.00).
    expect(await banner.textContent()).toMatch(/The payment of £(19\.9\d|20\.00) for invoice RTL-\d+ failed.*new runs are paused/);
    await screenshot(page, 'billing-6-past-due-phone');
    await banner.getByRole('button', { name: 'Go to Plan & billing' }).click();
    await page.getByText('Payment overdue', { exact: true }).first().waitFor();

    // Paying in the payment service's portal brings the plan back.
    await page.getByTestId('open-portal').click();
    await page.waitForURL(/\/portal\/bps_/);
    await page.getByLabel('New card number').fill(SUCCESS_CARD);
    await page.getByLabel('Expiry (MM/YY)').fill('12/34');
    await page.getByLabel('CVC').fill('123');
    await page.getByRole('button', { name: 'Save card and pay what is due' }).click();
    await page.getByText('active', { exact: true }).waitFor();
    await page.getByRole('link', { name: 'Back to Rotaloom' }).click();
    await page.getByText('Paid and current').waitFor({ timeout: 15_000 });
    expect(await page.getByTestId('past-due-banner').count()).toBe(0);
    const invoices = page.getByTestId('invoices');
    await invoices.getByText(/£(19\.9\d|20\.00)/).first().waitFor();
    expect(await invoices.getByText('Due', { exact: true }).count()).toBe(0);

    // Downgrade: stop at the end of the period, then change one's mind.
    await page.getByTestId('cancel-plan').click();
    await page.getByText(/The plan ends on .*; after that the Starter limits apply/).waitFor();
    await invoices.scrollIntoViewIfNeeded();
    await screenshot(page, 'billing-7-invoices-phone');
    await page.getByTestId('resume-plan').click();
    await page.getByText(/£16\.00 a month for 4 seats, renewing on/).waitFor();

    expect(problems).toEqual([]);
    await close();
  }, 180_000);
});

describe('billing is for admins only', () => {
  const browser = useBrowser();

  it('a coordinator has no Plan & billing in the navigation and the page says it is for admins', async () => {
    const { page, problems, close } = await openPage(browser(), PHONE);
    const res = await page.request.post('/api/auth/sign-in', { data: { email: 'coordinator@willowmere.example', password: DEMO_PASSWORD }, headers });
    expect(res.status()).toBe(200);
    await page.goto('/billing');
    await page.getByText('Only admins of this workspace see its plan and billing.').waitFor();
    expect(await page.getByRole('link', { name: 'Plan & billing' }).count()).toBe(0);
    expect(problems).toEqual([]);
    await close();
  });
});
