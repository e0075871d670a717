import { readEnv } from './env';
import { createSequelize } from './db/sequelize';
import { initModels } from './db/models';
import { RunWorker } from './runs/worker';

/**
 * `npm run worker`: a separate solve worker for when one machine (or one process) is not enough.
 * It shares the database with the server; runs are claimed with SKIP LOCKED, so start as many as
 * there are cores to spare. Start the server with ROTALOOM_IN_PROCESS_WORKER=0 to leave all
 * solving to these.
 */
async function main(): Promise<void> {
  const env = readEnv();
  const sequelize = createSequelize(env.db);
  initModels(sequelize);
  const worker = new RunWorker(sequelize, { log: (line) => console.log(line) });
  worker.start();
  console.log(`Rotaloom run worker ${worker.name} is waiting for runs (database ${env.db.host}:${env.db.port}/${env.db.database})`);
  const stop = async () => {
    await worker.stop();
    await sequelize.close();
    process.exit(0);
  };
  process.on('SIGINT', () => void stop());
  process.on('SIGTERM', () => void stop());
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
