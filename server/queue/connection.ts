import type { RedisOptions } from 'bullmq';

/**
 * ioredis options from a redis:// or rediss:// URL. Parsed here (not handed to ioredis as a URL)
 * so each role below can add its own settings to the same address.
 */
export function redisOptions(url: string): RedisOptions {
  const u = new URL(url);
  const db = u.pathname.length > 1 ? Number(u.pathname.slice(1)) : 0;
  return {
    host: u.hostname,
    port: u.port ? Number(u.port) : 6379,
    ...(u.username ? { username: decodeURIComponent(u.username) } : {}),
    ...(u.password ? { password: decodeURIComponent(u.password) } : {}),
    ...(Number.isInteger(db) && db > 0 ? { db } : {}),
    ...(u.protocol === 'rediss:' ? { tls: {} } : {}),
  };
}

/**
 * The API side adds jobs while a person waits for the answer: with the offline queue off and one
 * attempt per command, a Redis that is down fails the request at once (503) instead of holding it.
 * Reconnection still goes on in the background, so the next request works as soon as Redis is back.
 */
export function producerOptions(url: string): RedisOptions {
  return { ...redisOptions(url), enableOfflineQueue: false, maxRetriesPerRequest: 1, connectTimeout: 2000, retryStrategy: (times) => Math.min(times * 200, 2000) };
}

/** Workers and queue-event listeners block on Redis and must wait through an outage (BullMQ requires maxRetriesPerRequest null). */
export function workerOptions(url: string): RedisOptions {
  return { ...redisOptions(url), maxRetriesPerRequest: null, retryStrategy: (times) => Math.min(times * 200, 2000) };
}

/**
 * Every database gets its own key prefix, so test files (each with its own database) can share
 * one Redis, and so can a staging and a production install, without seeing each other's jobs.
 */
export const queuePrefix = (database: string) => `rotaloom:${database}`;
