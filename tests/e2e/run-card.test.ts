import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { launch, openPage, PHONE, screenshot, signIn, WIDE } from './helpers/browser';
import { api, makeRoster, removePersonAndRoster } from './helpers/api';

const DEMO = 'Willowmere House, January 2027';

/** Durations the card states, leaving out the limit the coordinator chose ("limit 5 s"). */
const durations = (text: string) => text.replace(/limit \d+(\.\d+)? s/g, '').match(/\d+(\.\d+)? s\b/g) ?? [];

async function runStatus(page: Page, id: number): Promise<string> {
  return (await api<{ status: string }>(page, 'GET', `/runs/${id}`)).status;
}

/**
 * Issue 20 fix 4: the run card shows one clear time, and while a run waits for a solver it says so
 * in words instead of empty figures ("— — —", "0.0 s of 15 s"). The e2e worker solves one run at a
 * time (ROTALOOM_WORKER_CONCURRENCY defaults to 1), so a long run of another roster keeps ours
 * queued for real until that run is cancelled.
 */
describe.each([
  ['phone', PHONE, '2029-03-05'],
  ['wide', WIDE, '2029-04-02'],
] as const)('run card at %s size', (label, viewport, blockerStart) => {
  let browser: Browser;
  const name = `Run card check ${label}`;
  const blockerName = `Run card blocker ${label}`;
  beforeAll(async () => {
    browser = await launch();
  });
  afterAll(async () => {
    await browser.close();
  });

  it('says in words that a run is queued, then shows one search time', { timeout: 300_000 }, async () => {
    const { page, problems, close } = await openPage(browser, viewport);
    await signIn(page);
    await removePersonAndRoster(page, '-', name);
    await removePersonAndRoster(page, '-', blockerName);
    const roster = await makeRoster(page, name, '2029-02-05', '2029-02-11');
    // The blocker is the demo roster copied forward: big enough that its solve uses its whole limit.
    const rosters = await api<{ items: Array<{ id: number; name: string }> }>(page, 'GET', '/rosters?pageSize=200');
    const demo = rosters.items.find((r) => r.name === DEMO)!;
    const blocker = (await api<{ roster: { id: number } }>(page, 'POST', `/rosters/${demo.id}/copy-forward`, { name: blockerName, periodStart: blockerStart })).roster;
    const blocking = await api<{ id: number }>(page, 'POST', `/rosters/${blocker.id}/runs`, { timeLimitSeconds: 60 });
    await expect.poll(() => runStatus(page, blocking.id), { timeout: 60_000 }).toBe('running');

    await page.goto(`/rosters/${roster.id}`);
    await page.getByRole('heading', { name }).waitFor();
    await page.getByTestId('section-solve').click();
    await page.getByTestId('solve-seconds').fill('5');
    await page.getByTestId('solve-start').click();
    const card = page.getByTestId('run-progress');
    await page.getByTestId('run-queued').waitFor();
    expect(await runStatus(page, blocking.id)).toBe('running');
    const queued = (await card.textContent()) ?? '';
    expect(queued).toMatch(/Queued/);
    expect(queued).toMatch(/no solver is free yet/);
    // No empty figures and no clock while nothing is solving.
    expect(queued).not.toContain('—');
    expect(durations(queued)).toEqual([]);
    expect(await card.getByTestId('run-time').count()).toBe(0);
    expect(await card.getByTestId('run-score').count()).toBe(0);
    expect(await card.getByRole('progressbar').getAttribute('aria-valuenow')).toBe('0');
    await card.scrollIntoViewIfNeeded();
    await screenshot(page, `run-card-${label}-01-queued`);

    // The solver frees up: ours runs and finishes, and its card names one duration.
    await api(page, 'POST', `/runs/${blocking.id}/cancel`);
    await page.getByTestId('run-show-result').waitFor({ timeout: 120_000 });
    const done = (await card.textContent()) ?? '';
    expect(done).not.toMatch(/Queued/);
    expect(done).not.toMatch(/Finished in/);
    expect(durations(done)).toHaveLength(1);
    expect(await card.getByTestId('run-time').count()).toBe(1);
    // The one time is the search's own clock, as the API reports it, within the limit chosen.
    const run = await api<{ id: number; progress: { elapsedMs?: number } | null; timeMs: number | null }>(page, 'GET', `/runs/${await latestRunId(page, roster.id)}`);
    const shown = Number((durations(done)[0] ?? '').replace(' s', ''));
    expect(Math.abs(shown - (run.progress?.elapsedMs ?? run.timeMs ?? 0) / 1000)).toBeLessThanOrEqual(0.051);
    expect(shown).toBeLessThanOrEqual(5.5);
    await card.scrollIntoViewIfNeeded();
    await screenshot(page, `run-card-${label}-02-finished`);

    await removePersonAndRoster(page, '-', name);
    await removePersonAndRoster(page, '-', blockerName);
    expect(problems).toEqual([]);
    await close();
  });
});

async function latestRunId(page: Page, rosterId: number): Promise<number> {
  const runs = await api<Array<{ id: number }> | { items: Array<{ id: number }> }>(page, 'GET', `/rosters/${rosterId}/runs`);
  const items = Array.isArray(runs) ? runs : runs.items;
  return Math.max(...items.map((r) => r.id));
}
