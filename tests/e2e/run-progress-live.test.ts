import { describe, expect, it } from 'vitest';
import { openPage, openRosterForSolving, PHONE, screenshot, signIn, useBrowser, WIDE } from './helpers/browser';

const ROSTER = 'Willowmere House, January 2027';

/**
 * A run's progress reaches the browser over server-sent events (GET /api/runs/:id/events, read by
 * Chromium's own EventSource), and polling of the run slows down while the stream is up.
 */
describe.each([
  ['phone', PHONE],
  ['wide', WIDE],
] as const)('live run progress at %s size', (label, viewport) => {
  const browser = useBrowser();

  it('follows the run through its event stream and shows the finished run', { timeout: 300_000 }, async () => {
    const { page, problems, close } = await openPage(browser(), viewport);
    const streams: Array<{ status: number; type: string }> = [];
    const polls: number[] = [];
    page.on('response', (res) => {
      const path = new URL(res.url()).pathname;
      if (/^\/api\/runs\/\d+\/events$/.test(path)) streams.push({ status: res.status(), type: res.headers()['content-type'] ?? '' });
      if (/^\/api\/runs\/\d+$/.test(path) && res.request().method() === 'GET') polls.push(Date.now());
    });
    await signIn(page);
    await openRosterForSolving(page, ROSTER);
    await page.getByTestId('section-solve').click();
    await page.getByTestId('solve-seconds').fill('8');
    await page.getByTestId('solve-start').click();
    await page.getByTestId('run-progress').waitFor();
    await page.getByTestId('run-score').waitFor({ timeout: 120_000 });
    const solvingFrom = Date.now();
    await screenshot(page, `run-progress-live-${label}-solving`);
    await page.getByTestId('run-show-result').waitFor({ timeout: 120_000 });
    const solvingMs = Date.now() - solvingFrom;
    await screenshot(page, `run-progress-live-${label}-done`);

    expect(streams.length).toBeGreaterThanOrEqual(1);
    expect(streams[0].status).toBe(200);
    expect(streams[0].type).toMatch(/^text\/event-stream/);
    // Polling at 0.5 s would have read the run about twice a second while it solved; with the stream
    // up it reads it every 15 s, plus once at the start and once for the finished run's roster.
    const polledWhileSolving = polls.filter((t) => t >= solvingFrom && t <= solvingFrom + solvingMs).length;
    expect(polledWhileSolving).toBeLessThan(Math.max(4, solvingMs / 1000));
    expect(problems).toEqual([]);
    await close();
  });
});
