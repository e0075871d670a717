import { Sequelize } from 'sequelize';
import type { Env } from '../env';

export function createSequelize(db: Env['db'], options: { logging?: boolean } = {}): Sequelize {
  return new Sequelize(db.database, db.user, db.password, {
    host: db.host,
    port: db.port,
    dialect: 'mariadb',
    logging: options.logging ? (sql) => console.log(sql) : false,
    // A request waits at most this long for a free connection, then answers 503 (http/errors.ts).
    pool: { max: 25, min: 0, idle: 10_000, acquire: Math.min(db.timeoutMs ?? 30_000, 10_000) },
    // Dates are stored in UTC; rosters carry their own IANA time zone.
    timezone: '+00:00',
    // socketTimeout: a MariaDB that stops answering (stalled, not down) fails the query after
    // this long instead of holding the request for ever. Longer than any query of ours takes.
    dialectOptions: { connectTimeout: 5_000, socketTimeout: db.timeoutMs ?? 30_000 },
    define: { underscored: true },
  });
}

/** Creates the database if needed; connects without selecting one, since it may not exist yet. */
export async function ensureDatabase(db: Env['db']): Promise<void> {
  const admin = new Sequelize('', db.user, db.password, {
    host: db.host,
    port: db.port,
    dialect: 'mariadb',
    logging: false,
    dialectOptions: { connectTimeout: 5_000 },
  });
  try {
    await admin.query(`CREATE DATABASE IF NOT EXISTS \`${db.database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  } finally {
    await admin.close();
  }
}

/** InnoDB's "deadlock found" (1213) and "lock wait timeout" (1205): the transaction was rolled back and may be run again. */
export function isRetryableLockError(err: unknown): boolean {
  const e = err as { parent?: { errno?: number }; original?: { errno?: number }; errno?: number } | null;
  const errno = e?.parent?.errno ?? e?.original?.errno ?? e?.errno;
  return errno === 1213 || errno === 1205;
}

/**
 * A managed transaction that is run again from the start when InnoDB chose it as a deadlock
 * victim. Retrying one statement (Sequelize's `retry` option) would be wrong here: InnoDB has
 * already rolled back the whole transaction, so only the whole callback can be repeated.
 * The callback must therefore have no effects outside the database.
 */
export async function transactionWithRetry<T>(sequelize: Sequelize, fn: (t: import('sequelize').Transaction) => Promise<T>, attempts = 6): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await sequelize.transaction(fn);
    } catch (err) {
      if (attempt >= attempts || !isRetryableLockError(err)) throw err;
      // Jittered back-off, so the same two transactions do not collide again in lockstep.
      await new Promise((r) => setTimeout(r, Math.random() * 20 * attempt));
    }
  }
}
