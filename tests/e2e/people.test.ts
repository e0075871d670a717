import { describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { baseUrl, DEMO_PASSWORD, openPage, PHONE, screenshot, signIn, useBrowser, WIDE } from './helpers/browser';


// Invented names, one set per screen size, so both runs can share the demo database.
const NAMES = {
  phone: ['Juniper Ashgrove', 'Lorcan Whitmoor', 'Tamsin Redfern'],
  wide: ['Ivo Marchetti-Lane', 'Perpetua Swale', 'Caspian Orme'],
} as const;

/** Takes away people an earlier run against the same database imported, so the run starts clean. */
async function removeEarlierRuns(page: Page, names: readonly string[]) {
  for (const name of names) {
    const found = (await (await page.request.get(`/api/people?q=${encodeURIComponent(name)}`)).json()) as { items: Array<{ id: number; name: string }> };
    for (const p of found.items.filter((x) => x.name === name)) {
      expect((await page.request.delete(`/api/people/${p.id}`, { headers: { 'x-rotaloom-csrf': '1' } })).status()).toBe(204);
    }
  }
}

const csv = (lines: string[]) => ({ name: 'new-staff.csv', mimeType: 'text/csv', buffer: Buffer.from(`${lines.join('\n')}\n`, 'utf8') });

/** A staff member's pairing request through the staff API (issue 7), as their phone would send it. */
async function staffRequestsApart(browser: Browser, colleagueName: string, reason: string) {
  const context = await browser.newContext({ baseURL: baseUrl() });
  const headers = { 'x-rotaloom-csrf': '1' };
  const signIn = await context.request.post('/api/auth/sign-in', { data: { email: 'staff@willowmere.example', password: DEMO_PASSWORD }, headers });
  expect(signIn.status()).toBe(200);
  const colleagues = (await (await context.request.get('/api/me/colleagues')).json()) as { items: Array<{ id: number; name: string }> };
  const colleague = colleagues.items.find((c) => c.name === colleagueName);
  expect(colleague, `${colleagueName} among the staff member's colleagues`).toBeDefined();
  const asked = await context.request.post('/api/me/pairings', { data: { colleagueId: colleague!.id, together: false, reason }, headers });
  expect(asked.status()).toBe(201);
  await context.close();
}

describe.each([
  ['phone', PHONE],
  ['wide', WIDE],
] as const)('coordinator: people, CSV import and pairings at %s size', (label, viewport) => {
  const browser = useBrowser();

  it('imports people from a CSV file (a row error first, then the fixed file), finds them, pairs two and approves a request', async () => {
    const [first, second, third] = NAMES[label];
    // The preview of the first file is a 200 with row errors; nothing on the page may fail.
    const { page, problems, close } = await openPage(browser(), viewport);
    await signIn(page, 'coordinator@willowmere.example');
    await removeEarlierRuns(page, NAMES[label]);

    // People, from the navigation.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'People' }).click();
    await page.getByRole('heading', { name: 'People', exact: true }).waitFor();
    await page.getByText('Priya Hollinshead').first().waitFor();
    expect(await page.getByTestId(label === 'wide' ? 'people-table' : 'people-cards').isVisible()).toBe(true);
    await screenshot(page, `people-1-list-${label}`);

    // Import: a file with a misspelt skill is refused row by row.
    await page.getByTestId('people-import').click();
    await page.getByRole('heading', { name: 'Import people from CSV' }).waitFor();
    await page.getByTestId('csv-file-input').setInputFiles(
      csv(['name,email,contracted_hours,skills', `${first},${first.split(' ')[0].toLowerCase()}@willowmere.example,30,First aid`, `${second},,24,fist aid`, `"${third}",,16,Medication round;Night lead`]),
    );
    const rowError = page.getByText("row 3: unknown skill 'fist aid' (did you mean 'First aid'?)");
    await rowError.waitFor();
    await rowError.scrollIntoViewIfNeeded();
    await page.getByText('3 rows: 2 new, 0 to update, 0 unchanged, 1 with errors', { exact: true }).waitFor();
    expect(await page.getByTestId('import-commit').count()).toBe(0);
    await screenshot(page, `people-2-import-row-error-${label}`);

    // The fixed file: a clean preview, then one all-or-nothing import.
    await page.getByTestId('csv-file-input').setInputFiles(
      csv(['name,email,contracted_hours,skills', `${first},${first.split(' ')[0].toLowerCase()}@willowmere.example,30,First aid`, `${second},,24,First aid`, `"${third}",,16,Medication round;Night lead`]),
    );
    await page.getByText('3 rows: 3 new, 0 to update, 0 unchanged, 0 with errors', { exact: true }).waitFor();
    await screenshot(page, `people-3-import-preview-${label}`);
    await page.getByTestId('import-commit').scrollIntoViewIfNeeded();
    await screenshot(page, `people-3b-import-ready-${label}`);
    await page.getByTestId('import-commit').click();
    await page.getByText('Imported from new-staff.csv: 3 added, 0 updated, 0 unchanged.').waitFor();
    await screenshot(page, `people-4-imported-${label}`);

    // They are in the list; a search finds one with its hours and skills.
    await page.getByTestId('import-see-people').click();
    await page.getByRole('heading', { name: 'People', exact: true }).waitFor();
    await page.getByTestId('people-search').fill(third.split(' ')[0]);
    const card = page.getByTestId(label === 'wide' ? `person-row-${third}` : `person-card-${third}`);
    await card.waitFor();
    expect(await card.innerText()).toMatch(/16 h/);
    expect(await card.innerText()).toMatch(/Medication round, Night lead|Night lead, Medication round/);
    await page.getByText(/^1 person match/).waitFor();
    await screenshot(page, `people-5-found-${label}`);

    // Pairings: two of the new people should share shifts.
    await staffRequestsApart(browser(), third, 'We keep arguing at handover');
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Pairings' }).click();
    await page.getByRole('heading', { name: 'Pairings', exact: true }).waitFor();
    await page.getByTestId('pairing-a').fill(first.split(' ')[0]);
    await page.getByRole('button', { name: `Choose ${first}` }).click();
    await page.getByTestId('pairing-b').fill(second.split(' ')[0]);
    await page.getByRole('button', { name: `Choose ${second}` }).click();
    await page.getByTestId('pairing-kind-together').click();
    await page.getByTestId('pairing-strength').fill('4');
    await page.getByTestId('pairing-add').click();
    await page.getByText(/^Added: .* together, \+4 points\.$/).waitFor();
    await screenshot(page, `people-6-pairing-added-${label}`);

    // The staff request shows with its reason; approving moves it into the table.
    const request = page.getByTestId('pairing-requests').getByText('“We keep arguing at handover”');
    await request.waitFor();
    await request.scrollIntoViewIfNeeded();
    await screenshot(page, `people-7-request-${label}`);
    const row = page.getByTestId('pairing-requests').locator('[data-testid^="request-"]').filter({ hasText: third });
    await row.getByRole('button', { name: 'Approve' }).click();
    await row.waitFor({ state: 'detached' });
    await page.getByTestId('pairing-search').fill(third.split(' ')[0]);
    // The search is debounced; wait until the table shows only pairings with that name.
    await expect.poll(async () => page.getByTestId('pairing-table').locator('[role="row"]').count(), { timeout: 10_000 }).toBe(1);
    const approved = page.getByTestId('pairing-table').locator('[role="row"]').filter({ hasText: third }).getByText('Reason given: “We keep arguing at handover”');
    await approved.waitFor();
    await approved.scrollIntoViewIfNeeded();
    await screenshot(page, `people-8-request-approved-${label}`);

    // Inline edit: a stronger "apart", saved with the version the row showed.
    const approvedRow = page.getByTestId('pairing-table').locator('[role="row"]').filter({ hasText: third });
    await approvedRow.getByRole('textbox').fill('7');
    await approvedRow.getByRole('button', { name: 'Save' }).click();
    await page.getByTestId('pairing-table').locator('[role="row"]').filter({ hasText: third }).getByText('apart, -7 points').waitFor();
    await screenshot(page, `people-8b-pairing-edited-${label}`);

    // Nothing wider than the screen.
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    expect(problems).toEqual([]);
    await close();
  });

  it('keeps what was typed when someone else saved the person first', async () => {
    const [first] = NAMES[label];
    const { page, problems, close } = await openPage(browser(), viewport, [/HTTP 409: PATCH .*\/api\/people\/\d+/, /status of 409/]);
    await signIn(page, 'coordinator@willowmere.example');
    await page.goto('/people');
    await page.getByTestId('people-search').fill(first.split(' ')[0]);
    await page.getByTestId(label === 'wide' ? `person-row-${first}` : `person-card-${first}`).click();
    await page.getByTestId('person-hours').waitFor();
    const id = Number(new URL(page.url()).pathname.split('/').pop());
    // Someone else saves first (same account, another tab's request).
    const current = (await (await page.request.get(`/api/people/${id}`)).json()) as { version: number };
    const other = await page.request.patch(`/api/people/${id}`, { data: { contractedHours: 12, version: current.version }, headers: { 'x-rotaloom-csrf': '1' } });
    expect(other.status()).toBe(200);
    await page.getByTestId('person-hours').fill('33');
    await page.getByTestId('person-save').click();
    await page.getByTestId('person-conflict').getByText(/Someone else changed this person while you were editing it/).waitFor();
    expect(await page.getByTestId('person-hours').inputValue()).toBe('33');
    await screenshot(page, `people-9-conflict-${label}`);
    await page.getByRole('button', { name: 'Save mine over theirs' }).click();
    await page.getByText('Saved.').waitFor();
    const saved = (await (await page.request.get(`/api/people/${id}`)).json()) as { contractedHours: number };
    expect(saved.contractedHours).toBe(33);
    expect(problems).toEqual([]);
    await close();
  });
});
