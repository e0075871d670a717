/**
 * Finished runs never change (the worker writes status, result and assignments once), so their
 * full answer is kept in memory, already serialised: reading a 4-week result then costs no run or
 * assignment query and no JSON.stringify of its 16 KiB.
 * Bounded (least recently used out first); keyed by run id and checked against the workspace.
 */
const MAX_ENTRIES = 200;
const cache = new Map<number, { workspaceId: number; json: string }>();

export const FINAL_STATUSES = new Set(['done', 'failed', 'cancelled']);

/** The finished run's answer as JSON text, or undefined when not cached (or another workspace's). */
export function cachedRun(runId: number, workspaceId: number): string | undefined {
  const hit = cache.get(runId);
  if (!hit || hit.workspaceId !== workspaceId) return undefined;
  cache.delete(runId);
  cache.set(runId, hit);
  return hit.json;
}

export function rememberRun(runId: number, workspaceId: number, body: unknown): string {
  const json = JSON.stringify(body);
  cache.set(runId, { workspaceId, json });
  if (cache.size > MAX_ENTRIES) cache.delete(cache.keys().next().value!);
  return json;
}
