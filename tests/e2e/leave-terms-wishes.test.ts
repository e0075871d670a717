import { describe, expect, it } from 'vitest';
import { openPage, PHONE, screenshot, signIn, useBrowser } from './helpers/browser';
import { api, makeRoster, removePersonAndRoster } from './helpers/api';

const PERSON = 'Wren Ashdown (no login, browser test)';
const ROSTER = 'Willowmere House, May 2027 (leave browser test)';

/**
 * Issue 12, "done when": on a phone a coordinator enters a fortnight of leave, a no-nights term
 * and three wishes for a person without a login, solves, and sees each one kept and explained.
 * The roster (3–23 May 2027, Mon–Sun weeks) has one early and one night seat a day; the leave
 * takes the first two weeks, the wishes fall in the third.
 */
describe('a coordinator on a phone enters leave, a term and wishes for someone without a login', () => {
  const browser = useBrowser();

  it('solves and every one is honoured and explained', { timeout: 300_000 }, async () => {
    const { page, problems, close } = await openPage(browser(), PHONE);
    const shot = (name: string) => screenshot(page, `leave-terms-wishes-phone-${name}`);
    await signIn(page);
    await removePersonAndRoster(page, PERSON, ROSTER);
    const person = await api<{ id: number }>(page, 'POST', '/people', { name: PERSON, email: null, contractedHours: 37.5, skillIds: [] });
    const roster = await makeRoster(page, ROSTER, '2027-05-03', '2027-05-23');

    // The person's screen: a no-nights term, then the fortnight of leave.
    await page.goto(`/people/${person.id}`);
    await page.getByTestId('terms-section').waitFor();
    await page.getByTestId('term-add').click();
    await page.getByTestId('term-kind').getByRole('radio', { name: 'Kind of term: No nights' }).click();
    await page.getByTestId('term-from').fill('2027-01-01');
    await shot('01-term-form');
    await page.getByTestId('term-save').click();
    await page.getByTestId('terms-section').getByText('No night shifts (hard)').waitFor();
    await page.getByTestId('person-absence-add').click();
    await page.getByTestId('absence-start').fill('2027-05-03');
    await page.getByTestId('absence-end').fill('2027-05-16');
    await shot('02-absence-form');
    await page.getByTestId('absence-save').click();
    await page.getByTestId('person-absences').getByText('Mon 3 May – Sun 16 May 2027 (14 days)').waitFor();
    await page.getByTestId('person-absences').scrollIntoViewIfNeeded();
    await shot('03-person');

    // The roster's wishes view, one week at a time: on to the third week.
    await page.goto(`/rosters/${roster.id}?section=wishes`);
    await page.getByTestId('wishes-view').waitFor();
    expect(await page.getByTestId('wishes-week').textContent()).toContain('Mon 3 May');
    await page.getByTestId('wishes-next').click();
    await page.getByTestId('wishes-next').click();
    expect(await page.getByTestId('wishes-week').textContent()).toContain('Mon 17 May');
    expect(await page.getByTestId('wishes-silent').textContent()).toContain(`${PERSON} · no login`);
    const wish = async (date: string, kind: 'prefer' | 'avoid' | 'cannot') => {
      await page.getByTestId(`wish-cell-${person.id}-${date}`).click();
      await page.getByTestId('wish-editor').waitFor();
      if (kind === 'prefer') await page.getByTestId('wish-day-strength').fill('30');
      await page.getByTestId(`wish-day-${kind}`).click();
      await page.getByTestId('wish-day-entered').getByText(/entered by Idris Penhallow/).waitFor();
    };
    await wish('2027-05-17', 'prefer');
    await wish('2027-05-18', 'avoid');
    await wish('2027-05-19', 'cannot');
    await page.getByTestId(`wish-cell-${person.id}-2027-05-19`).scrollIntoViewIfNeeded();
    await shot('04-wishes');
    expect(await page.getByTestId('wishes-silent').textContent()).not.toContain(PERSON);

    // Solve, then read how the roster treats this person.
    await page.getByTestId('section-solve').click();
    await page.getByTestId('solve-seconds').fill('3');
    await page.getByTestId('solve-start').click();
    await page.getByTestId('run-show-result').waitFor({ timeout: 120_000 });
    await shot('05-solved');
    await page.getByTestId('section-wishes').click();
    await page.getByTestId('wishes-next').click();
    await page.getByTestId('wishes-next').click();
    await page.getByTestId(`wish-cell-${person.id}-2027-05-17`).click();
    const outcome = page.getByTestId('person-outcome');
    await outcome.getByText(/in the latest roster/).waitFor({ timeout: 30_000 });
    const text = (await outcome.textContent()) ?? '';
    // Leave, term and the three wishes: five lines, each kept, with its reason.
    expect(await outcome.getByText('not kept').count()).toBe(0);
    expect(await outcome.getByText('kept', { exact: true }).count()).toBe(5);
    expect(text).toContain('Annual leave, Mon 3 May – Sun 16 May 2027 (14 days): on no shift while away');
    expect(text).toContain('No night shifts (hard): no night shift');
    expect(text).toContain('Prefer Mon 17 May: on the early shift');
    expect(text).toContain('Avoid Tue 18 May: not on shift');
    expect(text).toContain('Cannot Wed 19 May: not on shift');
    await outcome.scrollIntoViewIfNeeded();
    await shot('06-explained');

    // The same, checked straight from the run the API answers.
    const runs = await api<{ items: Array<{ id: number; status: string }> }>(page, 'GET', `/rosters/${roster.id}/runs`);
    const run = await api<{ assignments: Array<{ seatId: number; personId: number | null }> }>(page, 'GET', `/runs/${runs.items.find((r) => r.status === 'done')!.id}`);
    const shifts = await api<{ items: Array<{ label: string; startsLocal: string; seats: Array<{ id: number }> }> }>(page, 'GET', `/rosters/${roster.id}/shifts`);
    const mine = shifts.items.filter((s) => s.seats.some((seat) => run.assignments.some((a) => a.seatId === seat.id && a.personId === person.id)));
    expect(mine.filter((s) => s.startsLocal < '2027-05-17')).toEqual([]);
    expect(mine.filter((s) => s.label === 'night')).toEqual([]);
    expect(mine.some((s) => s.startsLocal.startsWith('2027-05-17'))).toBe(true);
    expect(mine.filter((s) => s.startsLocal.startsWith('2027-05-18') || s.startsLocal.startsWith('2027-05-19'))).toEqual([]);

    await removePersonAndRoster(page, PERSON, ROSTER);
    expect(problems).toEqual([]);
    await close();
  });
});
