import type { Sequelize } from 'sequelize';
import { readEnv } from '../../../server/env';
import { createSequelize } from '../../../server/db/sequelize';
import { initModels, Workspace } from '../../../server/db/models';

/**
 * The database the app under test uses (`npm test` seeds it with the demo), opened for setting up
 * what a browser test needs directly, and the demo workspace's id. Close the connection in afterAll.
 */
export async function openDemoDatabase(): Promise<{ sequelize: Sequelize; workspaceId: number }> {
  const sequelize = createSequelize(readEnv({ ...process.env, ROTALOOM_DB_NAME: 'rotaloom_e2e' }).db);
  initModels(sequelize);
  const workspace = await Workspace.findOne({ where: { name: 'Willowmere House' } });
  if (!workspace) throw new Error('the e2e database has no Willowmere House workspace: run browser tests through `npm test`');
  return { sequelize, workspaceId: workspace.id };
}
