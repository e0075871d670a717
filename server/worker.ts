import { readEnv } from './env';
import { createSequelize } from './db/sequelize';
import { initModels } from './db/models';
import { RunWorker } from './runs/worker';
import { closeQueues } from './queue/queues';

/**
 * `npm run worker`: a solve worker process. It takes jobs from the BullMQ queues on Redis
 * (ROTALOOM_REDIS_URL) and writes to the shared MariaDB, so start any number, on any machine that
 * reaches both. ROTALOOM_WORKER_CONCURRENCY runs that many solves at once (one thread each).
 */
async function main(): Promise<void> {
  const env = readEnv();
  const sequelize = createSequelize(env.db);
  initModels(sequelize);
  const lockMs = Number(process.env.ROTALOOM_QUEUE_LOCK_MS ?? '') || undefined;
  const worker = new RunWorker(sequelize, {
    name: process.env.ROTALOOM_WORKER_NAME || undefined,
    redisUrl: env.redis.url,
    concurrency: env.workerConcurrency,
    lockMs,
    log: (line) => console.log(`[worker] ${line}`),
  });
  worker.start();
  console.log(`[worker] ${worker.name} is waiting for jobs (Redis ${env.redis.url}, database ${env.db.host}:${env.db.port}/${env.db.database})`);
  let stopping = false;
  const stop = async () => {
    if (stopping) return;
    stopping = true;
    await worker.stop();
    await closeQueues(sequelize);
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
