import { randomBytes } from 'node:crypto';
import type { Sequelize } from 'sequelize';
import { readEnv, type Env } from '../../../server/env';
import { createSequelize, ensureDatabase } from '../../../server/db/sequelize';
import { initModels } from '../../../server/db/models';
import { migrateUp } from '../../../server/db/migrate';
import { closeQueues } from '../../../server/queue/queues';

export interface TestDb {
  env: Env;
  sequelize: Sequelize;
  drop(): Promise<void>;
}

/**
 * A fresh, migrated database of its own for one test file, on the throwaway MariaDB that
 * `npm test` starts (it sets ROTALOOM_DB_PORT). Files can then run in parallel.
 */
export async function createTestDb(overrides: Partial<NodeJS.ProcessEnv> = {}): Promise<TestDb> {
  if (!process.env.ROTALOOM_TEST_DB) {
    throw new Error('API tests need the throwaway MariaDB: run them through `npm test` (it sets ROTALOOM_TEST_DB and ROTALOOM_DB_PORT)');
  }
  const name = `rotaloom_t_${randomBytes(4).toString('hex')}`;
  const env = readEnv({ ...process.env, NODE_ENV: 'test', ROTALOOM_DB_NAME: name, ...overrides });
  await ensureDatabase(env.db);
  const sequelize = createSequelize(env.db);
  initModels(sequelize);
  await migrateUp(sequelize);
  return {
    env,
    sequelize,
    async drop() {
      // The file's queue connections to the shared test Redis (server/queue), opened on its first run.
      await closeQueues(sequelize);
      await sequelize.query(`DROP DATABASE \`${name}\``);
      await sequelize.close();
    },
  };
}
