import { describe, expect, it } from 'vitest';
import { openPage, openRosterForSolving, screenshot, signIn, solveAndOpenResult, useBrowser, WIDE } from './helpers/browser';

const ROSTER = 'Willowmere House, January 2027';

/**
 * Weights from a coordinator's edits, end to end: five hand edits saved in the browser (each
 * leaves a filled seat open), then on the Rules tab the suggestion in words, adopted; the roster's
 * rules then carry the suggested weights and the suggestion says who adopted it.
 */
describe('weight suggestion from real edits', () => {
  const browser = useBrowser();

  it('suggests weights after five saved edits, and adopting changes the rules on record', { timeout: 400_000 }, async () => {
    const { page, problems, close } = await openPage(browser(), WIDE);
    const shot = (name: string) => screenshot(page, `suggestion-${name}`);
    await signIn(page);
    await openRosterForSolving(page, ROSTER);
    const rosterId = page.url().match(/rosters\/(\d+)/)![1];
    await solveAndOpenResult(page);
    const before = await (await page.request.get(`/api/rosters/${rosterId}/suggestion`)).json();

    for (let i = 0; i < 5; i++) {
      await page.getByTestId('section-edit').click();
      await page.getByTestId('edit-panel').waitFor();
      // not Hattie Lowther's seat: another test pins her, and leaving a pinned seat open breaks the pin;
      // the first filled seat each time (the one left open before is open now)
      const seat = page.locator('[data-testid^="edit-seat-"]').filter({ hasNotText: /^open/ }).filter({ hasNotText: 'Hattie Lowther' }).first();
      await seat.click();
      await page.getByTestId('edit-people').getByRole('button', { name: 'Leave open' }).click();
      await page.getByTestId('edit-score').getByText(/1 seat changed/).waitFor({ timeout: 30_000 });
      await page.getByTestId('edit-save').click();
      await page.getByTestId('result-summary').getByText(/hand-edited/).waitFor({ timeout: 30_000 });
    }
    const recorded = await (await page.request.get(`/api/rosters/${rosterId}/suggestion`)).json();
    expect(recorded.edits).toBe(Math.min(60, before.edits + 5));

    await page.getByTestId('section-rules').click();
    await page.getByTestId('suggestion-section').waitFor();
    await page.getByTestId('suggestion-create').click();
    const words = page.getByTestId('suggestion-words');
    await words.waitFor({ timeout: 120_000 });
    expect(await words.textContent()).toMatch(/^Your edits suggest: .+ → .+ \(from \d+ edits over \d+ rosters?\)$/);
    await shot('1-open');

    const open = (await (await page.request.get(`/api/rosters/${rosterId}/suggestion`)).json()).suggestion;
    const rulesBefore = (await (await page.request.get(`/api/rosters/${rosterId}/rules`)).json()).rules;
    expect(open.status).toBe('open');
    // leaving seats open lowers 'every seat filled': the card says what that risks before adopting
    if (open.weights.some((w: { key: string; from: number; to: number }) => w.key === 'coverage' && w.to < w.from)) {
      await page.getByTestId('suggestion-open').getByText(/^Lower weights on .*every seat filled.*licensed practice/).waitFor();
    }
    await page.getByTestId('suggestion-adopt').click();
    await page.getByTestId('suggestion-decided').getByText(/adopted by/).waitFor({ timeout: 30_000 });
    await shot('2-adopted');

    const rules = (await (await page.request.get(`/api/rosters/${rosterId}/rules`)).json()).rules;
    for (const w of open.weights) expect(rules[w.key].weight).toBe(w.to);
    const after = (await (await page.request.get(`/api/rosters/${rosterId}/suggestion`)).json()).suggestion;
    expect(after).toMatchObject({ id: open.id, status: 'adopted', decidedBy: expect.any(String) });
    expect(after.decidedAt).not.toBeNull();
    expect(problems).toEqual([]);

    // The demo roster is shared by the other browser tests, which expect its own weights: put them back.
    const current = await (await page.request.get(`/api/rosters/${rosterId}/rules`)).json();
    const restored = await page.request.put(`/api/rosters/${rosterId}/rules`, { data: { rules: rulesBefore, version: current.version }, headers: { 'x-rotaloom-csrf': '1' } });
    expect(restored.status()).toBe(200);
    await close();
  });
});
