import { describe, expect, it } from 'vitest';
import { openPage, PHONE, screenshot, signIn, useBrowser, WIDE } from './helpers/browser';
import { api, makeRoster, removePersonAndRoster } from './helpers/api';

const PERSON = 'Corin Vale (browser test)';
const ROSTER = 'Willowmere House, June 2027 (wishes browser test)';

/**
 * Issue 12 screens at both sizes: a coordinator on a wide screen enters and changes an absence,
 * sets the credits, reads a CSV preview with a bad row, sees the whole period's wishes and sets
 * the deadline and the cannot-day limit; staff on a phone see that limit and ask for time away,
 * which the coordinator approves with one tap.
 */
describe('absences, terms and the wishes view', () => {
  const browser = useBrowser();

  it('a coordinator on a wide screen and staff on a phone', { timeout: 240_000 }, async () => {
    const coord = await openPage(browser(), WIDE);
    const page = coord.page;
    const shot = (name: string) => screenshot(page, `absences-wide-${name}`);
    await signIn(page);
    // The staff member's request of an earlier run would overlap this run's (same days).
    const removeStaffRequests = async () => {
      const all = await api<{ items: Array<{ id: number; note: string | null }> }>(page, 'GET', '/absences');
      for (const a of all.items.filter((x) => x.note === 'Family wedding (browser test)')) await api(page, 'DELETE', `/absences/${a.id}`);
    };
    await removeStaffRequests();
    await removePersonAndRoster(page, PERSON, ROSTER);
    const person = await api<{ id: number }>(page, 'POST', '/people', { name: PERSON, email: null, contractedHours: 30, skillIds: [] });
    const roster = await makeRoster(page, ROSTER, '2027-06-07', '2027-07-04');

    // Absences: add one through the person picker, then change it.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Absences' }).click();
    await page.getByRole('heading', { name: 'Absences', exact: true }).waitFor();
    await page.getByTestId('absence-add').click();
    await page.getByTestId('absence-person').fill('Corin');
    await page.getByRole('button', { name: `Choose ${PERSON}` }).click();
    await page.getByTestId('absence-kind').getByRole('radio', { name: 'Kind of absence: Training' }).click();
    await page.getByTestId('absence-start').fill('2027-06-10');
    // A last day before the first is refused on the spot, naming the field.
    await page.getByTestId('absence-end').fill('2027-06-09');
    await page.getByTestId('absence-save').click();
    await page.getByText('The absence ends before it starts').waitFor();
    await page.getByTestId('absence-end').fill('2027-06-10');
    await page.getByTestId('absence-part').getByRole('radio', { name: 'How much of the day: Part of a day' }).click();
    await page.getByTestId('absence-start-time').fill('09:00');
    await page.getByTestId('absence-end-time').fill('13:00');
    await page.getByTestId('absence-credit').fill('4');
    await shot('01-form');
    await page.getByTestId('absence-save').click();
    await page.getByText(`Added: ${PERSON}, training`).waitFor();
    const list = page.getByTestId('absence-list');
    await list.getByText('Thu 10 Jun 2027, 09:00–13:00').waitFor();
    const mine = await api<{ items: Array<{ id: number }> }>(page, 'GET', `/absences?personId=${person.id}`);
    const id = mine.items[0].id;
    await page.getByTestId(`absence-edit-${id}`).click();
    await page.getByTestId('absence-note').fill('First-aid refresher');
    await page.getByTestId('absence-save').click();
    await list.getByText('Note: First-aid refresher').waitFor();
    await shot('02-list');

    // Credits per kind, saved.
    await page.getByTestId('credit-other').getByRole('radio', { name: 'Other credits: Set hours' }).click();
    await page.getByTestId('credit-other-hours').fill('3');
    await page.getByTestId('credit-save').click();
    await page.getByText('Saved. Absences without their own hours now credit these.').waitFor();
    await page.getByTestId('credit-other').getByRole('radio', { name: 'Other credits: Set hours' }).click();
    await page.getByTestId('credit-other-hours').fill('0');
    await page.getByTestId('credit-save').click();

    // CSV import: the preview names the bad row and offers no import.
    await page.getByTestId('absence-import-link').click();
    await page.getByRole('heading', { name: 'Import absences from CSV' }).waitFor();
    await page.getByTestId('csv-file-input').setInputFiles({ name: 'leave.csv', mimeType: 'text/csv', buffer: Buffer.from(`person,kind,start_date,end_date\n${PERSON},annual,2027-06-20,2027-06-14\n`) });
    await page.getByTestId('absence-import-preview').waitFor();
    expect(await page.getByTestId('absence-import-summary').textContent()).toMatch(/1 row: 0 ready, 1 with errors/);
    expect(await page.getByTestId('absence-import-commit').count()).toBe(0);
    await shot('03-import');

    // The wishes view: the whole period at once, and the wish settings.
    await page.goto(`/rosters/${roster.id}?section=wishes`);
    await page.getByTestId('wishes-view').waitFor();
    expect(await page.getByTestId('wishes-prev').count()).toBe(0);
    await page.getByTestId(`wish-cell-${person.id}-2027-07-04`).waitFor();
    await page.getByTestId(`wish-cell-${person.id}-2027-06-08`).click();
    await page.getByTestId('wish-day-avoid').click();
    await page.getByTestId('wish-day-entered').waitFor();
    await page.getByTestId(`wish-cell-${person.id}-2027-06-08`).hover();
    expect(await page.getByTestId('wishes-hint').textContent()).toMatch(/Avoid \(5 points\) all day, entered by Idris Penhallow/);
    await page.getByTestId('wish-day-none').click();
    await page.getByTestId('wish-day-entered').waitFor({ state: 'detached' });
    await page.getByTestId('wish-deadline-date').fill('2027-05-31');
    await page.getByTestId('wish-deadline-time').fill('18:00');
    await page.getByTestId('wish-cannot-limit').fill('3');
    await page.getByTestId('wish-settings-save').click();
    await page.getByText('Wish settings saved').waitFor();
    await page.getByTestId(`wish-cell-${person.id}-2027-06-07`).scrollIntoViewIfNeeded();
    await shot('04-wishes');

    // Staff on a phone: the limit as the coordinator set it, and a request for time away.
    const staff = await openPage(browser(), PHONE);
    await signIn(staff.page, 'staff@willowmere.example');
    await staff.page.goto('/wishes');
    // The rosters load first; with more than one being planned, a picker chooses ours.
    await staff.page.getByTestId('roster-wishes').waitFor();
    const picker = staff.page.getByTestId('roster-picker');
    if (await picker.count()) await picker.getByRole('radio', { name: ROSTER }).click();
    await staff.page.getByTestId('roster-wishes').getByText(ROSTER).waitFor();
    expect(await staff.page.getByTestId('cannot-limit').textContent()).toMatch(/of at most 3 for this roster/);
    expect(await staff.page.getByTestId('wish-terms').textContent()).toMatch(/Open for wishes until Monday 31 May at 18:00/);
    await screenshot(staff.page, 'absences-staff-phone-01-wishes');
    await staff.page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Time away' }).click();
    await staff.page.getByTestId('my-absence-start').fill('2027-06-21');
    await staff.page.getByTestId('my-absence-end').fill('2027-06-22');
    await staff.page.getByTestId('my-absence-note').fill('Family wedding (browser test)');
    await staff.page.getByTestId('my-absence-save').click();
    await staff.page.getByTestId('time-away-list').getByText('Waiting for a decision').first().waitFor();
    await screenshot(staff.page, 'absences-staff-phone-02-requested');

    // The coordinator approves it with one tap; the person sees it approved.
    await page.goto('/absences');
    const request = page.getByTestId('absence-requests').locator('[data-testid^="absence-request-"]', { hasText: 'Family wedding (browser test)' });
    await request.waitFor();
    await request.getByRole('button', { name: 'Approve' }).click();
    await request.waitFor({ state: 'detached' });
    await staff.page.reload();
    const card = staff.page.getByTestId('time-away-list').locator('[data-testid^="my-absence-"]', { hasText: 'Family wedding (browser test)' });
    await card.getByText('Approved', { exact: true }).waitFor();
    await screenshot(staff.page, 'absences-staff-phone-03-approved');
    await removeStaffRequests();

    await removePersonAndRoster(page, PERSON, ROSTER);
    expect(coord.problems).toEqual([]);
    expect(staff.problems).toEqual([]);
    await staff.close();
    await coord.close();
  });
});
