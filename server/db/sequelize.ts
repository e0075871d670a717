import { Sequelize } from 'sequelize';
import type { Env } from '../env';

export function createSequelize(db: Env['db'], options: { logging?: boolean } = {}): Sequelize {
  return new Sequelize(db.database, db.user, db.password, {
    host: db.host,
    port: db.port,
    dialect: 'mariadb',
    logging: options.logging ? (sql) => console.log(sql) : false,
    pool: { max: 25, min: 0, idle: 10_000 },
    // Dates are stored in UTC; rosters carry their own IANA time zone.
    timezone: '+00:00',
    dialectOptions: { connectTimeout: 5_000 },
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
