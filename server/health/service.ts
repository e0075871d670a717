import type { Sequelize } from 'sequelize';

/** Whether the database answers a trivial query within a second: a hung connection counts as down. */
export async function databaseAnswers(sequelize: Sequelize): Promise<boolean> {
  try {
    await Promise.race([
      sequelize.query('SELECT 1'),
      new Promise((_, reject) => setTimeout(() => reject(new Error('timeout')), 1_000)),
    ]);
    return true;
  } catch {
    return false;
  }
}
