import { describe, expect, it } from 'vitest';
import { openPage, PHONE, screenshot, useBrowser, WIDE } from './helpers/browser';

describe.each([
  ['phone', PHONE],
  ['wide', WIDE],
] as const)('signed-out pages at %s size', (label, viewport) => {
  const browser = useBrowser();

  it('shows the landing page with the product name, its own fonts and a sign-in form', async () => {
    const { page, problems, close } = await openPage(browser(), viewport);
    await page.goto('/');
    await page.getByRole('heading', { name: /Rosters your team can trust/ }).waitFor();
    expect(await page.getByLabel('Rotaloom').first().isVisible()).toBe(true);
    expect(await page.getByLabel('E-mail').isVisible()).toBe(true);
    expect(await page.getByLabel('Password').isVisible()).toBe(true);
    // The committed TTF files, not a system fallback: the browser reports the face as loaded.
    const loaded = await page.evaluate(async () => {
      await document.fonts.ready;
      return ['AtkinsonHyperlegible', 'Fraunces-SemiBold'].map((f) => document.fonts.check(`16px "${f}"`));
    });
    expect(loaded).toEqual([true, true]);
    // Nothing wider than the screen (a phone must not scroll sideways).
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    await screenshot(page, `landing-${label}`);
    expect(problems).toEqual([]);
    await close();
  });

  it('checks the sign-in form before sending anything', async () => {
    const { page, problems, close } = await openPage(browser(), viewport);
    await page.goto('/');
    await page.getByLabel('E-mail').fill('not-an-address');
    await page.getByTestId('sign-in-submit').click();
    await page.getByText('This is not an e-mail address').waitFor();
    await page.getByText('Enter your password').waitFor();
    expect(problems).toEqual([]);
    await close();
  });

  it('answers an unknown address with 404 and its own not-found page, readable before the code runs', async () => {
    // The 404 of the page itself is the point here (RFC 9110 §15.5.5), not a failure.
    const { page, problems, close } = await openPage(browser(), viewport, [/^HTTP 404: GET \S+\/no\/such\/page$/, /^console: Failed to load resource: the server responded with a status of 404/]);
    const raw = await page.request.get('/no/such/page');
    expect(raw.status()).toBe(404);
    expect(raw.headers()['content-type']).toMatch(/^text\/html/);
    expect(await raw.text()).toContain('This page is not on the roster');
    const answer = await page.goto('/no/such/page');
    expect(answer?.status()).toBe(404);
    await page.getByRole('heading', { name: 'This page is not on the roster' }).waitFor();
    await screenshot(page, `not-found-${label}`);
    await page.getByText('Back to the start').click();
    await page.getByRole('heading', { name: /Rosters your team can trust/ }).waitFor();
    expect(problems).toEqual([]);
    await close();
  });
});

describe("the landing page's code", () => {
  const browser = useBrowser();

  it('stays within the issue\'s 350 KB of JavaScript on a first visit, without the forms\' or charts\' chunks', async () => {
    const { page, problems, close } = await openPage(browser(), PHONE);
    const scripts: Array<{ name: string; encoding: string; bytes: number }> = [];
    const sized: Array<Promise<void>> = [];
    page.on('requestfinished', (req) => {
      if (req.resourceType() !== 'script') return;
      sized.push(
        (async () => {
          // What crossed the wire: the compressed body and the response's headers (issue 19 counts
          // transferred JavaScript, 1 KB = 1,000 bytes).
          const [sizes, response] = await Promise.all([req.sizes(), req.response()]);
          scripts.push({ name: new URL(req.url()).pathname.split('/').pop()!, encoding: (await response?.allHeaders())?.['content-encoding'] ?? 'none', bytes: sizes.responseBodySize + sizes.responseHeadersSize });
        })(),
      );
    });
    await page.goto('/');
    await page.getByRole('heading', { name: /Rosters your team can trust/ }).waitFor();
    await page.waitForLoadState('networkidle');
    await Promise.all(sized);
    const names = scripts.map((s) => s.name.replace(/-[0-9a-f]{32}\.js$/, ''));
    expect(names).toEqual(expect.arrayContaining(['__expo-metro-runtime', '__common', 'entry']));
    // react-hook-form (components/forms/form-kit-impl.ts) and the bar chart load with the screens that use them.
    expect(names.filter((n) => /form-kit|bar-chart/.test(n))).toEqual([]);
    // Chromium asks this local server for Brotli, as it asks any HTTPS site; the build ships .br copies.
    expect(new Set(scripts.map((s) => s.encoding))).toEqual(new Set(['br']));
    const total = scripts.reduce((n, s) => n + s.bytes, 0);
    expect(total).toBeLessThan(350_000);
    expect(problems).toEqual([]);
    await close();
  });
});
