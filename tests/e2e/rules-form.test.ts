import { describe, expect, it } from 'vitest';
import { openPage, PHONE, screenshot, signIn, useBrowser, WIDE } from './helpers/browser';
import { api, makeRoster } from './helpers/api';

/**
 * The rules form reads the rule catalogue (issue 12): each Directive rule named for what it checks
 * with its article (Directive 2003/88/EC, Art. 5 with Art. 16(a); Art. 6 with Art. 16(b); Art. 8),
 * the local policies marked as having no source, the caution shown; a wrong number is named in
 * words beside its field and nothing is saved; a right one is saved as typed.
 */
describe.each([
  ['phone', PHONE],
  ['wide', WIDE],
] as const)('the rules form at %s size', (label, viewport) => {
  const browser = useBrowser();

  it('names each rule and its source, refuses a bad number in words, saves a good one', { timeout: 180_000 }, async () => {
    const { page, problems, close } = await openPage(browser(), viewport);
    const shot = (name: string) => screenshot(page, `rules-form-${label}-${name}`);
    await signIn(page);
    const name = `Rules form browser test (${label})`;
    const old = await api<{ items: Array<{ id: number; name: string }> }>(page, 'GET', '/rosters?pageSize=200');
    for (const r of old.items.filter((x) => x.name === name)) await api(page, 'DELETE', `/rosters/${r.id}`).catch(() => undefined);
    const roster = await makeRoster(page, name, '2027-06-07', '2027-06-20');

    await page.goto(`/rosters/${roster.id}?section=rules`);
    const weekly = page.getByTestId('rule-weeklyRest');
    await weekly.waitFor();
    expect(await weekly.textContent()).toContain('Weekly rest');
    expect(await weekly.textContent()).toContain('Directive 2003/88/EC, Art. 5, Art. 16(a)');
    expect(await page.getByTestId('rule-averageWeeklyHours').textContent()).toContain('Art. 6, Art. 16(b)');
    expect(await page.getByTestId('rule-nightAverage').textContent()).toContain('Art. 8');
    expect(await page.getByTestId('rule-maxHoursPer7Days').textContent()).toContain('common practice, no source');
    expect(await page.getByText(/local law, agreements and licensed practice/).count()).toBeGreaterThan(0);
    await shot('01-form');

    // 200 h of rest in 7 days is out of range: said beside the field, nothing saved
    const before = await api<{ rules: { weeklyRest: { hours: number } }; version: number }>(page, 'GET', `/rosters/${roster.id}/rules`);
    const hours = weekly.getByLabel('Uninterrupted rest of (hours)');
    await hours.fill('200');
    await page.getByTestId('rules-save').click();
    await weekly.getByRole('alert').waitFor();
    expect(await weekly.getByRole('alert').textContent()).toBe('Enter a number from 1 to 168.');
    await weekly.scrollIntoViewIfNeeded();
    await shot('02-bad-number');
    const unchanged = await api<{ rules: { weeklyRest: { hours: number } }; version: number }>(page, 'GET', `/rosters/${roster.id}/rules`);
    expect(unchanged.version).toBe(before.version);
    expect(unchanged.rules.weeklyRest.hours).toBe(35);

    // 36 h is fine; the 7-day hours cap (a local policy, off by default) turned on as soft
    await hours.fill('36');
    await page.getByTestId('rule-maxHoursPer7Days').getByRole('radio', { name: /Soft/ }).click();
    await page.getByTestId('rules-save').click();
    await page.getByText('Rules saved. Solve again to apply them.').waitFor();
    const saved = await api<{ rules: { weeklyRest: { hours: number }; maxHoursPer7Days: { enabled: boolean; hard: boolean } } }>(page, 'GET', `/rosters/${roster.id}/rules`);
    expect(saved.rules.weeklyRest.hours).toBe(36);
    expect(saved.rules.maxHoursPer7Days).toMatchObject({ enabled: true, hard: false });
    await shot('03-saved');

    await api(page, 'DELETE', `/rosters/${roster.id}`);
    expect(problems).toEqual([]);
    await close();
  });
});
