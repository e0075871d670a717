import { RunRow } from '../../../server/rosters/models';

/** Polls until `check` returns something truthy, or fails naming what it waited for. */
export async function waitFor<T>(what: string, check: () => Promise<T | null | undefined | false>, timeoutMs = 60_000, everyMs = 100): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await check();
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`timed out after ${timeoutMs} ms waiting for ${what}`);
    await new Promise((r) => setTimeout(r, everyMs));
  }
}

export const FINAL = new Set(['done', 'failed', 'cancelled']);

export const runFinished = (id: number, timeoutMs = 90_000) =>
  waitFor(`run ${id} to finish`, async () => {
    const row = await RunRow.findByPk(id);
    return row && FINAL.has(row.status) ? row : null;
  }, timeoutMs);

/**
 * Watches run rows every 50 ms and notes when each was first seen running, and how many of one
 * workspace's runs were seen running at once. Timestamps in the table have whole seconds only,
 * which is too coarse to order short runs.
 */
export function watchRuns(ids: () => number[]) {
  const firstRunning = new Map<number, number>();
  const maxAtOnce = new Map<number, number>();
  let stopped = false;
  const loop = (async () => {
    while (!stopped) {
      const rows = await RunRow.findAll({ where: { id: ids() }, attributes: ['id', 'workspaceId', 'status'] });
      const now = Date.now();
      const running = new Map<number, number>();
      for (const r of rows) {
        if (r.status !== 'queued' && !firstRunning.has(r.id)) firstRunning.set(r.id, now);
        if (r.status === 'running') running.set(r.workspaceId, (running.get(r.workspaceId) ?? 0) + 1);
      }
      for (const [ws, n] of running) maxAtOnce.set(ws, Math.max(maxAtOnce.get(ws) ?? 0, n));
      await new Promise((r) => setTimeout(r, 50));
    }
  })();
  return {
    firstRunning,
    maxAtOnce,
    async stop() {
      stopped = true;
      await loop;
    },
  };
}
