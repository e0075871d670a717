import { describe, expect, it } from 'vitest';
import { openPage, openRosterForSolving, PHONE, screenshot, signIn, solveAndOpenResult, useBrowser, WIDE } from './helpers/browser';

const ROSTER = 'Willowmere House, January 2027';

/**
 * Seat details as a coordinator reads them: the seat's holder, how contested the seat is in words
 * (with the meter), and each alternative with the best change found and the bound above it.
 * Solves the demo roster first (3 s), reopening it when the workflow test left it published.
 */
describe.each([
  ['phone', PHONE],
  ['wide', WIDE],
] as const)('seat details at %s size', (label, viewport) => {
  const browser = useBrowser();

  it('shows who is on a seat, how contested it is and the alternatives with both figures', { timeout: 300_000 }, async () => {
    const { page, problems, close } = await openPage(browser(), viewport);
    const shot = (name: string) => screenshot(page, `seat-details-${label}-${name}`);
    await signIn(page);
    await openRosterForSolving(page, ROSTER);

    // A fresh solved run (the newest one may be a hand-edited save, which has no marginals);
    // a roster published by the workflow test is reopened first, as that test does.
    await solveAndOpenResult(page);
    // The result opens on the grid; the month and day list is the other view.
    await page.getByRole('radio', { name: 'Show the roster as: Month and days' }).click();
    await page.getByTestId('day-list').waitFor();

    // The first filled seat of the first day that is not pinned.
    const chips = page.locator('[data-testid^="seat-"]:not([data-testid^="seat-p"]):not([data-testid^="seat-u"]):not([data-testid^="seat-s"])');
    await chips.first().waitFor();
    let chosen = -1;
    for (let i = 0; i < (await chips.count()); i++) {
      const text = (await chips.nth(i).textContent()) ?? '';
      if (!text.includes('pinned') && !text.startsWith('Open')) {
        chosen = i;
        break;
      }
    }
    expect(chosen, 'a filled, unpinned seat on the first day').toBeGreaterThanOrEqual(0);
    const chip = chips.nth(chosen);
    const holder = ((await chip.textContent()) ?? '').trim();
    await chip.scrollIntoViewIfNeeded();
    await chip.click();
    const panel = page.getByTestId('seat-panel');
    await panel.waitFor();
    await panel.getByText('Alternatives', { exact: true }).waitFor({ timeout: 60_000 });
    // the top of the panel: holder, how contested, pin
    await panel.evaluate((el) => el.scrollIntoView({ block: 'start' }));
    await shot('01-panel');

    // How contested, in plain words (the demo is loopy: approximate); the method's name only in the details line.
    const contested = (await panel.getByTestId('seat-panel-contested').textContent()) ?? '';
    expect(contested).toMatch(/^(Settled|Leaning|Contested): .* of good rosters .*\(approximate\)\.$/);
    expect(contested).not.toMatch(/sum-product|passes/);
    expect(holder.startsWith(contested.split(' put ')[1]?.split(' on this shift')[0] ?? '—')).toBe(true);
    const meter = panel.getByRole('meter');
    expect(await meter.getAttribute('aria-label')).toMatch(/of good rosters .* \(approximate\)$/);

    // Each alternative says what was found and the bound above it, for screen readers too.
    const rows = panel.locator('[data-testid^="seat-panel-alt-"]');
    expect(await rows.count()).toBeGreaterThan(0);
    const first = (await rows.first().getAttribute('aria-label')) ?? '';
    expect(first).toMatch(/^Best roster found with .+ here: (no change|[−+][\d,]+(\.\d)? points); at most [−+]?[\d,]+(\.\d)? \(bound\)\./);
    expect(await panel.getByText(/dual bound|sum-product/).count()).toBe(0);
    await panel.getByTestId('seat-panel-method-toggle').click();
    expect(await panel.getByTestId('seat-panel-method-detail').textContent()).toMatch(/dual bound.*loopy sum-product, (converged|stopped) after \d+ pass/);
    const rowBox = await rows.first().boundingBox();
    expect(rowBox!.width).toBeLessThanOrEqual(viewport.width);
    await rows.nth(Math.min(4, (await rows.count()) - 1)).evaluate((el) => el.scrollIntoView({ block: 'end' }));
    await shot('02-alternatives');

    // Closing and opening again is answered from the query cache at once (no spinner).
    await chip.click();
    await chip.click();
    await panel.getByText('Alternatives', { exact: true }).waitFor({ timeout: 5_000 });
    expect(problems).toEqual([]);
    await close();
  });
});
