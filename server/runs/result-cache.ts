import { createHash } from 'node:crypto';

/**
 * Finished runs never change (the worker writes status, result and assignments once), so their
 * full answer is kept in memory, already serialised with its ETag: reading a 4-week result then
 * costs no run or assignment query and no JSON.stringify or hashing of its 16 KiB, and a client
 * that sends If-None-Match gets 304 with no body.
 * Bounded (least recently used out first); keyed by run id and checked against the workspace.
 */
const MAX_ENTRIES = 200;
export type CachedRun = { workspaceId: number; json: string; etag: string };
const cache = new Map<number, CachedRun>();

export const FINAL_STATUSES = new Set(['done', 'failed', 'cancelled']);

/** The finished run's answer as JSON text, or undefined when not cached (or another workspace's). */
export function cachedRun(runId: number, workspaceId: number): CachedRun | undefined {
  const hit = cache.get(runId);
  if (!hit || hit.workspaceId !== workspaceId) return undefined;
  cache.delete(runId);
  cache.set(runId, hit);
  return hit;
}

export function rememberRun(runId: number, workspaceId: number, body: unknown): CachedRun {
  const json = JSON.stringify(body);
  // Express's own weak ETag form (length and SHA-1), computed once instead of on every answer.
  const etag = `W/"${Buffer.byteLength(json).toString(16)}-${createHash('sha1').update(json).digest('base64').slice(0, 27)}"`;
  const entry = { workspaceId, json, etag };
  cache.set(runId, entry);
  if (cache.size > MAX_ENTRIES) cache.delete(cache.keys().next().value!);
  return entry;
}
