import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Server } from 'node:http';
import { readEnv, rootDir } from '../env';
import { createApp } from '../app';
import { fakeEnv, startFakes } from '../../fakes';
import { CHROMIUM, ensureDebianPackages, MARIADB, REDIS } from './system-packages';
import { startRedis } from './redis';
import { startWorkerProcess } from './worker-process';
import { freePort, startMariaDb } from './mariadb';
import { prepareDatabase } from './database';
import { buildWebIfChanged } from './web-build';

const log = (line: string) => console.log(`[test] ${line}`);

interface Tally {
  passed: number;
  failed: number;
  skipped: number;
}

function run(command: string, args: string[], env: NodeJS.ProcessEnv): Promise<number> {
  return new Promise((resolve) => {
    const child = spawn(command, args, { cwd: rootDir, env, stdio: 'inherit' });
    child.on('exit', (code) => resolve(code ?? 1));
  });
}

function readVitestJson(file: string): Tally | null {
  if (!existsSync(file)) return null;
  const r = JSON.parse(readFileSync(file, 'utf8')) as {
    numPassedTests: number;
    numFailedTests: number;
    numFailedTestSuites: number;
    numPendingTests: number;
    numTodoTests: number;
  };
  // A file that fails to load or whose setup throws fails no test but must still count as a failure.
  const failed = r.numFailedTests > 0 ? r.numFailedTests : r.numFailedTestSuites;
  return { passed: r.numPassedTests, failed, skipped: r.numPendingTests + r.numTodoTests };
}

/**
 * `npm test`: a throwaway MariaDB and Redis in a temporary folder on free loopback ports, the unit and API
 * tests, the typecheck, and the browser tests against the built app. Everything it starts is
 * stopped again, also when something fails.
 */
async function main(): Promise<number> {
  // e.g. `npm test -- unit` or `npm test -- e2e`; test file paths after the part run only those files
  const args = process.argv.slice(2);
  const files = args.filter((a) => a.includes('/') || a.endsWith('.ts'));
  const only = args.filter((a) => !files.includes(a));
  // After Ctrl-C the step in progress ends on its own; the steps after it are skipped.
  const wants = (part: string) => !interrupted && (only.length === 0 || only.includes(part));
  ensureDebianPackages(wants('e2e') ? [...MARIADB, ...REDIS, ...CHROMIUM] : [...MARIADB, ...REDIS]);
  const tmp = mkdtempSync(path.join(os.tmpdir(), 'rotaloom-test-'));
  const port = await freePort();
  const redisPort = await freePort();
  const bin = (name: string) => path.join(rootDir, 'node_modules', '.bin', name);
  const tally: Tally = { passed: 0, failed: 0, skipped: 0 };
  const add = (t: Tally | null, label: string) => {
    if (!t) {
      tally.failed += 1;
      log(`${label}: no results were written (the runner failed to start)`);
      return;
    }
    tally.passed += t.passed;
    tally.failed += t.failed;
    tally.skipped += t.skipped;
  };
  const cleanups: Array<() => Promise<unknown>> = [];
  try {
    // Each service's stop is registered as soon as it runs, so one failing to start never leaves the other behind.
    const [, redis] = await Promise.all([
      startMariaDb({ dataDir: path.join(tmp, 'mariadb'), port, log: (l) => log(`mariadb: ${l}`) }).then((db) => (cleanups.push(() => db.stop()), db)),
      // One throwaway Redis for every test file: each database has its own key prefix (server/queue/connection.ts).
      startRedis({ dataDir: path.join(tmp, 'redis'), port: redisPort, log: (l) => log(`redis: ${l}`) }).then((r) => (cleanups.push(() => r.stop()), r)),
      // ROTALOOM_WEB_DIR lets two checkouts' test runs build side by side without sharing dist/.
      wants('e2e') ? buildWebIfChanged(rootDir, readEnv(process.env).webDir).then((r) => log(`web app ${r}`)) : Promise.resolve(),
    ]);
    const childEnv: NodeJS.ProcessEnv = { ...process.env, NODE_ENV: 'test', ROTALOOM_TEST_DB: '1', ROTALOOM_DB_PORT: String(port), ROTALOOM_DB_HOST: '127.0.0.1', ROTALOOM_REDIS_URL: redis.url };

    if (wants('unit')) {
      log('unit and API tests (vitest)');
      const out = path.join(tmp, 'unit.json');
      await run(bin('vitest'), ['run', '--reporter=default', '--reporter=json', `--outputFile.json=${out}`, ...files], childEnv);
      add(readVitestJson(out), 'unit and API tests');
    }

    if (wants('typecheck')) {
      log('typecheck (tsc --noEmit)');
      const code = await run(bin('tsc'), ['--noEmit', '-p', 'tsconfig.json'], childEnv);
      add({ passed: code === 0 ? 1 : 0, failed: code === 0 ? 0 : 1, skipped: 0 }, 'typecheck');
      log(code === 0 ? 'typecheck passed' : 'typecheck FAILED');
    }

    if (wants('e2e')) {
      const fakes = await startFakes();
      cleanups.push(() => fakes.stop());
      // A known port, so links in e-mails (built from the public URL) point at this server.
      const appPort = await freePort();
      fakes.stripe.webhookUrl = `http://127.0.0.1:${appPort}/api/billing/webhook`;
      const env = readEnv({ ...childEnv, ROTALOOM_DB_NAME: 'rotaloom_e2e', ROTALOOM_PORT: String(appPort), ...fakeEnv(fakes, {}) });
      const sequelize = await prepareDatabase(env.db, (l) => log(`e2e database: ${l}`));
      cleanups.push(() => sequelize.close());
      const server: Server = await new Promise((resolve) => {
        const s = createApp({ env, sequelize }).listen(appPort, '127.0.0.1', () => resolve(s));
      });
      cleanups.push(() => new Promise((resolve) => server.close(resolve)));
      if (env.inProcessWorker) {
        const worker = startWorkerProcess({ ...childEnv, ROTALOOM_DB_NAME: 'rotaloom_e2e' }, { log: (l) => log(`worker: ${l}`) });
        cleanups.push(() => worker.stop());
      }
      const address = server.address();
      const url = `http://127.0.0.1:${typeof address === 'object' && address ? address.port : 0}`;
      log(`browser tests (Chromium through playwright-core) against ${url}`);
      const out = path.join(tmp, 'e2e.json');
      await run(bin('vitest'), ['run', '-c', 'tests/e2e/vitest.config.ts', '--reporter=default', '--reporter=json', `--outputFile.json=${out}`, ...files], {
        ...childEnv,
        ROTALOOM_E2E_URL: url,
        ROTALOOM_MAIL_FAKE_URL: `http://127.0.0.1:${fakes.mail.httpPort}`,
        ROTALOOM_STRIPE_FAKE_URL: fakes.stripe.url,
      });
      add(readVitestJson(out), 'browser tests');
    }
  } catch (err) {
    tally.failed += 1;
    console.error(`[test] setup failed: ${err instanceof Error ? err.message : String(err)}`);
  } finally {
    for (const cleanup of cleanups.reverse()) await cleanup().catch((err) => console.error(err));
    rmSync(tmp, { recursive: true, force: true });
  }
  console.log('');
  console.log(`Summary: ${tally.passed} passed, ${tally.failed} failed, ${tally.skipped} skipped`);
  return tally.failed === 0 && tally.passed > 0 ? 0 : 1;
}

let interrupted = false;
process.on('SIGINT', () => {
  // The children share the terminal and stop on their own; finally{} then stops MariaDB.
  interrupted = true;
});
main().then((code) => process.exit(interrupted ? 130 : code));
