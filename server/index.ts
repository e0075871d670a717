import { readEnv } from './env';
import { createSequelize } from './db/sequelize';
import { initModels } from './db/models';
import { createApp } from './app';
import { listenHttp } from './bootstrap/listen';

/** Serves the API and web build against an already running, migrated database (see server/bootstrap for the whole stack). */
async function main(): Promise<void> {
  const env = readEnv();
  const sequelize = createSequelize(env.db);
  initModels(sequelize);
  const app = createApp({ env, sequelize });
  const server = await listenHttp(app, env.port, env.host);
  console.log(`Rotaloom listening on ${env.publicUrl}`);
  const stop = () => server.close(() => void sequelize.close().then(() => process.exit(0)));
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
