import type { Sequelize } from 'sequelize';
import type { Env } from '../env';
import { createSequelize, ensureDatabase } from '../db/sequelize';
import { initModels } from '../db/models';
import { migrateUp } from '../db/migrate';
import { seedDemoIfEmpty } from '../db/seed';

/** Creates the database if missing, applies migrations and seeds the demo when empty. */
export async function prepareDatabase(db: Env['db'], log: (line: string) => void): Promise<Sequelize> {
  await ensureDatabase(db);
  const sequelize = createSequelize(db);
  initModels(sequelize);
  const applied = await migrateUp(sequelize);
  log(applied.length ? `applied migrations: ${applied.join(', ')}` : 'schema up to date');
  if (await seedDemoIfEmpty(sequelize)) log('seeded the Willowmere House demo workspace');
  return sequelize;
}
