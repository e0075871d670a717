import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { launch, openPage, PHONE, screenshot, signIn, WIDE } from './helpers/browser';
import { api, makeRoster, removePersonAndRoster, solveThroughApi } from './helpers/api';

const inView = async (page: Page, testId: string, viewport: { width: number; height: number }) => {
  const box = await page.getByTestId(testId).boundingBox();
  return box !== null && box.x >= 0 && box.y >= 0 && box.x + box.width <= viewport.width + 0.5 && box.y + box.height <= viewport.height + 0.5;
};

/**
 * The new-user workflow of issue 20 without dead ends, on a roster of its own: tabs in view, the
 * weekday order, one caution, moving someone in Edit with the score in view and the people who
 * already work that day set apart, publishing after a confirmation naming who is mailed, a frozen
 * roster that says how to solve again, copy forward, the roster period's date picker, next steps,
 * the person-added confirmation, the pairing-kind radios and the CSV button; staff set a weekly
 * wish for one kind of shift.
 */
describe.each([
  ['phone', PHONE, '2027-09-06'],
  ['wide', WIDE, '2027-10-04'],
] as const)('roster workflow fixes at %s size', (label, viewport, start) => {
  let browser: Browser;
  const name = `Workflow check ${label}`;
  const person = `Quillon Marsh ${label}`;
  const end = start.replace(/\d\d$/, (d) => String(Number(d) + 2).padStart(2, '0'));
  const nextStart = start.replace(/\d\d$/, (d) => String(Number(d) + 7).padStart(2, '0'));
  beforeAll(async () => {
    browser = await launch();
  });
  afterAll(async () => {
    await browser.close();
  });

  it('walks from setup to publish and copy forward without a dead end', { timeout: 300_000 }, async () => {
    const { page, problems, close } = await openPage(browser, viewport);
    const shot = (n: string) => screenshot(page, `workflow-${label}-${n}`);
    await signIn(page);
    await removePersonAndRoster(page, person, name);
    await removePersonAndRoster(page, person, `${name} (next)`);

    // ---- overview: next steps for a coordinator ----
    await page.getByTestId('next-steps').waitFor();
    expect(await page.getByTestId('next-steps').getByRole('listitem').count()).toBe(4);
    await shot('01-overview');

    // ---- the roster period's date picker: a typed date and a day picked from the month view ----
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Rosters' }).click();
    await page.getByTestId('roster-start').fill('2027-11-01');
    await page.getByTestId('roster-end-calendar-toggle').click();
    const calendar = page.getByTestId('roster-end-calendar');
    await calendar.waitFor();
    await calendar.scrollIntoViewIfNeeded();
    await shot('02-period-picker');
    await calendar.getByText('14', { exact: true }).first().click();
    expect(await page.getByTestId('roster-end').inputValue()).toBe('2027-11-14');

    // ---- a roster of its own, early and night each day, plus a pattern saved Saturday first ----
    const roster = await makeRoster(page, name, start, end);
    await api(page, 'POST', `/rosters/${roster.id}/patterns`, { label: 'weekend', weekdays: ['sat', 'sun', 'mon'], startTime: '10:00', endTime: '14:00', seats: [{ skillId: null, count: 1 }] });
    await page.goto(`/rosters/${roster.id}`);
    await page.getByRole('heading', { name }).waitFor();

    // Every tab in view at rest (fix 5).
    for (const key of ['setup', 'rules', 'wishes', 'solve', 'result', 'edit', 'publish']) expect(await inView(page, `section-${key}`, viewport), key).toBe(true);
    // Weekdays Monday first (fix 11).
    await page.getByText(/^Mon Sat Sun · 10:00–14:00/).waitFor();
    // The caution once for the roster (fix 13): one line, the full text a tap away.
    expect(await page.getByTestId('roster-caution').count()).toBe(1);
    expect(await page.getByText(/Local law, collective agreements/).count()).toBe(0);
    await page.getByTestId('roster-caution-toggle').click();
    await page.getByText(/Local law, collective agreements/).waitFor();
    await shot('03-tabs-caution');

    // ---- staff: "avoid Monday nights" while the roster is open for wishes ----
    const staffPage = await openPage(browser, viewport);
    await signIn(staffPage.page, 'staff@willowmere.example');
    await staffPage.page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Wishes' }).click();
    await staffPage.page.getByTestId('roster-wishes').waitFor();
    const chip = staffPage.page.getByRole('radio', { name });
    if (await chip.count()) await chip.click();
    await staffPage.page.getByRole('heading', { name }).waitFor();
    await staffPage.page.getByTestId('weekly-open').click();
    await staffPage.page.getByTestId('weekly-weekday').getByRole('radio', { name: 'Mon' }).click();
    await staffPage.page.getByTestId('weekly-shift-kind').getByRole('radio', { name: 'night shifts' }).click();
    await staffPage.page.getByTestId('weekly-kind').getByRole('radio', { name: 'Avoid' }).click();
    await staffPage.page.getByRole('button', { name: 'Avoid night shifts on Mondays' }).click();
    await staffPage.page.getByText('Saved: avoid on 1 night shift.').waitFor();
    await screenshot(staffPage.page, `workflow-${label}-04-staff-weekly-shift-kind`);
    expect(staffPage.problems).toEqual([]);
    await staffPage.close();

    // ---- Edit: move someone with the score in view; holder left out, those working that day apart ----
    const { id: runId } = await solveThroughApi(page, roster.id);
    await page.reload();
    await page.getByTestId('section-edit').click();
    const seats = page.locator('[data-testid^="edit-seat-"]');
    await seats.first().waitFor();
    // The chip's name reads "<skill> seat on the <shift> shift: <holder>".
    const holder = ((await seats.first().getAttribute('aria-label')) ?? '').split(': ').pop()!.trim();
    expect(holder).not.toBe('');
    await seats.first().click();
    const people = page.getByTestId('edit-people');
    await people.waitFor();
    expect(await people.getByRole('button', { name: holder, exact: true }).count()).toBe(0);
    const busy = people.getByRole('group', { name: 'Already working that day' }).getByRole('button');
    expect(await busy.count()).toBeGreaterThan(0);
    // Each listed once: free to move here, or set apart as already working that day.
    const busyNames = await busy.allTextContents();
    const free = people.getByTestId('edit-people-free').getByRole('button').filter({ hasNotText: 'Leave open' });
    for (const n of await free.allTextContents()) expect(busyNames).not.toContain(n);
    await people.evaluate((el) => el.scrollIntoView({ block: 'end' }));
    expect(await inView(page, 'edit-score', viewport)).toBe(true);
    await shot('05-edit-move');
    await free.first().click();
    await page.getByText(/1 seat changed/).waitFor();
    expect(await inView(page, 'edit-score', viewport)).toBe(true);

    // ---- Publish asks first, naming who is mailed (fix 6) ----
    await page.getByTestId('section-publish').click();
    await page.getByTestId('publish-go').click();
    const confirm = page.getByTestId('publish-confirm');
    await confirm.getByTestId('publish-confirm-changed').waitFor();
    // The screen names everyone the server would mail (the API's own answer is tested against the outbox).
    const preview = await api<{ willMail: Array<{ name: string }>; changed: unknown[] }>(page, 'GET', `/rosters/${roster.id}/publish-preview?runId=${runId}`);
    const mailText = (await confirm.getByTestId('publish-confirm-mail').textContent()) ?? '';
    for (const m of preview.willMail) expect(mailText).toContain(m.name);
    expect(await confirm.getByTestId('publish-confirm-changed').textContent()).toContain(`${preview.changed.length} `);
    await confirm.evaluate((el) => el.scrollIntoView({ block: 'center' }));
    await shot('06-publish-confirm');
    await page.getByTestId('publish-confirm-go').click();
    await page.getByTestId('publish-mail-report').waitFor();

    // A published roster says how to go on instead of greying things out (fixes 1 and 9).
    await page.getByTestId('section-setup').click();
    await page.getByTestId('pattern-frozen').waitFor();
    expect(await page.getByTestId('pattern-label').count()).toBe(0);
    await page.getByTestId('section-solve').click();
    await page.getByTestId('solve-frozen').waitFor();
    await shot('07-solve-frozen');
    await page.getByTestId('solve-reopen').click();
    await page.getByTestId('solve-start').waitFor();
    expect(await page.getByTestId('solve-start').isEnabled()).toBe(true);

    // ---- copy forward a week on ----
    await page.getByTestId('copy-forward-open-panel').click();
    await page.getByTestId('copy-forward-start').fill(nextStart);
    expect(await page.getByTestId('copy-forward-period').textContent()).toMatch(/: 3 days, like this one, in Europe\/London\.$/);
    await shot('08-copy-forward');
    await page.getByTestId('copy-forward-go').click();
    const done = page.getByTestId('copy-forward-done');
    await done.waitFor();
    expect(await done.textContent()).toMatch(/Copied: 3 shift patterns \(\d+ shifts over the new period\), the rules\./);
    await shot('09-copy-forward-done');
    await page.getByTestId('copy-forward-open').click();
    await page.getByRole('heading', { name: `${name} (next)` }).waitFor();
    await page.getByText(/^Mon Sat Sun · 10:00–14:00/).waitFor();
    await shot('10-copied-roster');

    // ---- adding a person says so (fix 12) ----
    await page.waitForLoadState('networkidle'); // leaving mid-load would abort requests (counted as problems)
    await page.goto('/people/new');
    await page.getByTestId('person-name').fill(person);
    await page.getByTestId('person-hours').fill('20');
    await page.getByTestId('person-save').click();
    await page.getByTestId('people-added').getByText(`Added ${person}.`).waitFor();
    await shot('11-person-added');

    // ---- controls a screen reader names correctly (fix 14) ----
    await page.waitForLoadState('networkidle'); // leaving mid-load would abort requests (counted as problems)
    await page.goto('/pairings');
    const kinds = page.getByRole('radiogroup', { name: 'Kind of pairing', exact: true });
    await kinds.waitFor();
    expect(await kinds.getByRole('radio').count()).toBe(3);
    expect(await kinds.getByRole('checkbox').count()).toBe(0);
    await page.waitForLoadState('networkidle'); // leaving mid-load would abort requests (counted as problems)
    await page.goto('/people/import');
    const chooser = page.getByRole('button', { name: 'Choose a CSV file' });
    await chooser.waitFor();
    const [fileChooser] = await Promise.all([page.waitForEvent('filechooser'), chooser.click()]);
    expect(fileChooser.isMultiple()).toBe(false);

    await removePersonAndRoster(page, person, name);
    await removePersonAndRoster(page, person, `${name} (next)`);
    expect(problems).toEqual([]);
    await close();
  });
});
