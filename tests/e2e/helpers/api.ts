import type { Page } from 'playwright-core';

/** JSON calls to the API from a signed-in page, as the app makes them (session cookie and CSRF header). */
export async function api<T>(page: Page, method: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE', path: string, body?: unknown): Promise<T> {
  const res = await page.request.fetch(`/api${path}`, { method, headers: { 'x-rotaloom-csrf': '1', 'content-type': 'application/json' }, data: body === undefined ? undefined : JSON.stringify(body) });
  const text = await res.text();
  if (!res.ok()) throw new Error(`${method} ${path}: ${res.status()} ${text}`);
  return (text ? JSON.parse(text) : undefined) as T;
}

/** A roster of its own for one test: early and night shifts every day, one seat each. */
export async function makeRoster(page: Page, name: string, periodStart: string, periodEnd: string): Promise<{ id: number }> {
  const roster = await api<{ id: number }>(page, 'POST', '/rosters', { name, periodStart, periodEnd, timeZone: 'Europe/London' });
  const all = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'];
  await api(page, 'POST', `/rosters/${roster.id}/patterns`, { label: 'early', weekdays: all, startTime: '07:00', endTime: '15:00', seats: [{ skillId: null, count: 1 }] });
  await api(page, 'POST', `/rosters/${roster.id}/patterns`, { label: 'night', weekdays: all, startTime: '23:00', endTime: '07:00', seats: [{ skillId: null, count: 1 }] });
  return roster;
}

/** Removes what a test made, whatever state an earlier, interrupted run left it in. */
export async function removePersonAndRoster(page: Page, personName: string, rosterName: string): Promise<void> {
  const rosters = await api<{ items: Array<{ id: number; name: string }> }>(page, 'GET', '/rosters?pageSize=200');
  for (const r of rosters.items.filter((x) => x.name === rosterName)) await api(page, 'DELETE', `/rosters/${r.id}`).catch(() => undefined);
  const people = await api<{ items: Array<{ id: number; name: string }> }>(page, 'GET', `/people?q=${encodeURIComponent(personName)}&pageSize=50`);
  for (const p of people.items.filter((x) => x.name === personName)) {
    const absences = await api<{ items: Array<{ id: number }> }>(page, 'GET', `/absences?personId=${p.id}`);
    for (const a of absences.items) await api(page, 'DELETE', `/absences/${a.id}`).catch(() => undefined);
    // Terms and absences hold on to the person (RESTRICT), so they go first.
    const terms = await api<{ items: Array<{ id: number }> }>(page, 'GET', `/people/${p.id}/terms`);
    for (const t of terms.items) await api(page, 'DELETE', `/people/${p.id}/terms/${t.id}`).catch(() => undefined);
    await api(page, 'DELETE', `/people/${p.id}`).catch(() => undefined);
  }
}

/** Starts a short solve through the API and waits for the worker to finish it; the finished run. */
export async function solveThroughApi(page: Page, rosterId: number): Promise<{ id: number; score: number; assignments: Array<{ seatId: number; personId: number | null }> }> {
  const start = await api<{ id: number }>(page, 'POST', `/rosters/${rosterId}/runs`, { timeLimitSeconds: 2 });
  for (let i = 0; i < 240; i++) {
    const r = await api<{ id: number; status: string; score: number; error?: string | null; assignments: Array<{ seatId: number; personId: number | null }> }>(page, 'GET', `/runs/${start.id}`);
    if (r.status === 'done') return r;
    if (r.status === 'failed' || r.status === 'cancelled') throw new Error(`run ${start.id} ${r.status}: ${r.error ?? 'no reason given'}`);
    await page.waitForTimeout(500);
  }
  throw new Error(`run ${start.id} did not finish`);
}
