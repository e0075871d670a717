/**
 * Finished runs never change (the worker writes status, result and assignments once), so their
 * full answer is kept in memory: reading a 4-week result then costs no run or assignment query.
 * Bounded (least recently used out first); keyed by run id and checked against the workspace.
 */
const MAX_ENTRIES = 200;
const cache = new Map<number, { workspaceId: number; body: unknown }>();

export const FINAL_STATUSES = new Set(['done', 'failed', 'cancelled']);

export function cachedRun(runId: number, workspaceId: number): unknown | undefined {
  const hit = cache.get(runId);
  if (!hit || hit.workspaceId !== workspaceId) return undefined;
  cache.delete(runId);
  cache.set(runId, hit);
  return hit.body;
}

export function rememberRun(runId: number, workspaceId: number, body: unknown): void {
  cache.set(runId, { workspaceId, body });
  if (cache.size > MAX_ENTRIES) cache.delete(cache.keys().next().value!);
}
