import { Umzug, SequelizeStorage } from 'umzug';
import type { QueryInterface, Sequelize } from 'sequelize';
import { migrations } from './migrations';

export type MigrationContext = QueryInterface;

function makeUmzug(sequelize: Sequelize) {
  return new Umzug<MigrationContext>({
    migrations: migrations.map((m) => ({
      name: m.name,
      up: ({ context }) => m.up(context),
      down: ({ context }) => m.down(context),
    })),
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: undefined,
  });
}

/** Applies every versioned migration not yet applied; returns the names it ran. */
export async function migrateUp(sequelize: Sequelize): Promise<string[]> {
  const done = await makeUmzug(sequelize).up();
  return done.map((m) => m.name);
}

export async function migrateDownAll(sequelize: Sequelize): Promise<void> {
  await makeUmzug(sequelize).down({ to: 0 });
}
