import path from 'node:path';
import type { Server } from 'node:http';
import { readEnv, rootDir, type Env } from '../env';
import { createApp } from '../app';
import { fakeEnv, startFakes } from '../../fakes';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../db/seed';
import { ensureDebianPackages, MARIADB, REDIS } from './system-packages';
import { startMariaDb } from './mariadb';
import { startRedis } from './redis';
import { startWorkerProcess } from './worker-process';
import { prepareDatabase } from './database';
import { buildWebIfChanged } from './web-build';
import { listenHttp } from './listen';

const log = (line: string) => console.log(`[rotaloom] ${line}`);

/** `npm start` after its port check: MariaDB, migrations, demo seed, fakes, web build and the server, stopped cleanly on Ctrl-C. */
export async function startStack(env: Env): Promise<void> {
  ensureDebianPackages(env.redis.external ? MARIADB : [...MARIADB, ...REDIS]);
  const servers = [
    startMariaDb({ dataDir: path.join(env.dataDir, 'mariadb'), port: env.db.port, useRunning: env.useRunningDb }),
    // The queue of solve jobs; ROTALOOM_REDIS_URL means someone else runs it.
    env.redis.external ? Promise.resolve(null) : startRedis({ dataDir: path.join(env.dataDir, 'redis'), port: env.redis.port }),
  ] as const;
  const [db, redis, web] = await Promise.all([...servers, buildWebIfChanged(rootDir, env.webDir)]).catch(async (err: unknown) => {
    // One refused (another checkout's, a busy port): the other, started meanwhile, must not outlive us.
    for (const settled of await Promise.allSettled(servers)) if (settled.status === 'fulfilled') await settled.value?.stop();
    throw err;
  });
  log(`web app ${web}`);
  const cleanups: Array<() => Promise<unknown>> = [() => db.stop()];
  if (redis) cleanups.push(() => redis.stop());
  let stopping = false;
  const stop = async (code: number) => {
    if (stopping) return;
    stopping = true;
    log('stopping …');
    for (const cleanup of cleanups.reverse()) await cleanup().catch((err) => console.error(err));
    process.exit(code);
  };
  process.on('SIGINT', () => void stop(0));
  process.on('SIGTERM', () => void stop(0));
  try {
    const sequelize = await prepareDatabase(env.db, log);
    cleanups.push(() => sequelize.close());
    const fakes = await startFakes();
    cleanups.push(() => fakes.stop());
    log(`mail fake: SMTP on 127.0.0.1:${fakes.mail.smtpPort}, messages at http://127.0.0.1:${fakes.mail.httpPort}/messages`);
    // Outside production the server talks to the fakes for every service not configured for real.
    const appEnv = env.nodeEnv === 'production' ? env : readEnv({ ...process.env, NODE_ENV: env.nodeEnv, ...fakeEnv(fakes) });
    if (appEnv !== env) log(`Google sign-in fake at ${fakes.google.url}; sent mail at ${env.publicUrl}/dev/mail`);
    fakes.stripe.webhookUrl = `http://${env.host === '0.0.0.0' ? '127.0.0.1' : env.host}:${env.port}/api/billing/webhook`;
    if (appEnv.billing?.host) log(`payments fake at ${fakes.stripe.url} (test cards: 4242 4242 4242 4242 succeeds, 4000 0000 0000 0002 is declined)`);
    const app = createApp({ env: appEnv, sequelize });
    const server: Server = await listenHttp(app, env.port, env.host);
    cleanups.push(() => new Promise((resolve) => server.close(resolve)));
    if (env.inProcessWorker) {
      // A worker process of its own, as in production: the server process never runs the solver.
      const worker = startWorkerProcess({ ...process.env, NODE_ENV: env.nodeEnv, ROTALOOM_REDIS_URL: env.redis.url }, { log });
      cleanups.push(() => worker.stop());
    }
    console.log('');
    console.log(`  Rotaloom is running at ${env.publicUrl}`);
    console.log(`  Demo sign-in (password ${DEMO_PASSWORD}):`);
    for (const a of DEMO_ACCOUNTS) console.log(`    ${a.role.padEnd(12)} ${a.email}`);
    console.log('  Press Ctrl-C to stop (the worker, Redis and MariaDB are stopped with it).');
    console.log('');
  } catch (err) {
    console.error(`[rotaloom] could not start: ${err instanceof Error ? err.message : String(err)}`);
    await stop(1);
  }
}

