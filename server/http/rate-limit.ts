import { rateLimit, type Options } from 'express-rate-limit';
import { RedisStore, type RedisReply } from 'rate-limit-redis';
import type { Sequelize } from 'sequelize';
import { queues, queueSettings, quietErrors } from '../queue/queues';

/**
 * rate-limit-redis keeps the script ids it loaded as promises and never loads again after a failure
 * that is not NOSCRIPT, so a Redis that was down when the API started would leave the limit off for
 * good. Loading again whenever the last load failed makes it pick up once Redis answers.
 */
/** BullMQ types its connection as its own IRedisClient; underneath it is ioredis (server/queue/connection.ts), whose call() sends any command. */
type RawCommands = { call(command: string, ...args: string[]): Promise<unknown> };

class ReloadingRedisStore extends RedisStore {
  override async increment(key: string) {
    this.incrementScriptSha = this.incrementScriptSha.catch(() => this.loadIncrementScript());
    return super.increment(key);
  }
  override async get(key: string) {
    this.getScriptSha = this.getScriptSha.catch(() => this.loadGetScript());
    return super.get(key);
  }
}

/**
 * An express-rate-limit middleware whose counts live in Redis (rate-limit-redis), on the queue's
 * connection and under its per-database prefix, so every API process behind the load balancer
 * counts against the same limit. A Redis that is down lets requests through (logged, at most every
 * 30 s): these limits slow down abuse, and refusing every sign-up during an outage would be worse.
 */
export function sharedRateLimit(sequelize: Sequelize, name: string, options: Partial<Options>) {
  const log = quietErrors(`rate limit ${name}`);
  return rateLimit({
    ...options,
    passOnStoreError: true,
    logger: { error: (err) => log(err instanceof Error ? err : new Error(String(err))), warn: () => {} },
    store: new ReloadingRedisStore({
      prefix: `${queueSettings(sequelize).prefix}:rl:${name}:`,
      sendCommand: async (command: string, ...args: string[]) => ((await queues(sequelize).runs.client) as unknown as RawCommands).call(command, ...args) as Promise<RedisReply>,
    }),
  });
}
