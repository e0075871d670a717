import { describe, expect, it } from 'vitest';
import { openPage, PHONE, screenshot, useBrowser, WIDE } from './helpers/browser';

describe('signed-in navigation shell', () => {
  const browser = useBrowser();

  it.each([
    ['phone', PHONE, 'bottom-tabs', 'side-nav'],
    ['wide', WIDE, 'side-nav', 'bottom-tabs'],
  ] as const)('at %s size puts the navigation where it belongs', async (label, viewport, shown, hidden) => {
    const { page, problems, close } = await openPage(browser(), viewport);
    await page.goto('/');
    await page.getByLabel('E-mail').fill('coordinator@willowmere.example');
    await page.getByLabel('Password').fill('willowmere-demo');
    await page.getByTestId('sign-in-submit').click();
    await page.getByRole('heading', { name: /Hello, Idris/ }).waitFor();
    expect(await page.getByTestId(shown).isVisible()).toBe(true);
    expect(await page.getByTestId(hidden).count()).toBe(0);
    // The caution every roster carries is on the first page after sign-in.
    expect(await page.getByText(/Local law, collective agreements/).isVisible()).toBe(true);
    await screenshot(page, `home-${label}`);
    expect(problems).toEqual([]);
    await close();
  });
});
