/**
 * `npm run bench:api`: a bounded loopback load check of reading a 4-week roster result
 * (GET /api/runs/:id: run, result summary and every seat's assignment) with 50 concurrent
 * clients, written with Node's http module only.
 *
 * It starts its own throwaway MariaDB (temporary folder, free loopback port), seeds the
 * Willowmere demo, solves its four-week roster once, then sends a fixed number of requests
 * (--requests, default 5000) from --clients (default 50) keep-alive connections, each client
 * sending its next request when the previous answer arrived. The clients run in a worker thread
 * (load-client.mjs) so they do not share the server's event loop. Reports p50/p95/p99 latency and
 * requests per second; exits 1 if any request failed or p95 is over the 100 ms target.
 */
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import { mkdtempSync, rmSync } from 'node:fs';
import type { Server } from 'node:http';
import { Worker } from 'node:worker_threads';
import { performance } from 'node:perf_hooks';
import { readEnv } from '../env';
import { createApp } from '../app';
import { freePort, startMariaDb } from '../bootstrap/mariadb';
import { prepareDatabase } from '../bootstrap/database';
import { RunWorker } from '../runs/worker';
import { closeQueues } from '../queue/queues';
import { startRedis } from '../bootstrap/redis';
import { Roster } from '../rosters/models';
import { DEMO_PASSWORD } from '../db/seed';

const arg = (name: string, fallback: number) => {
  const i = process.argv.indexOf(`--${name}`);
  const v = i >= 0 ? Number(process.argv[i + 1]) : fallback;
  if (!Number.isFinite(v) || v <= 0) throw new Error(`--${name} needs a positive number`);
  return v;
};
const REQUESTS = Math.min(100_000, arg('requests', 5000));
const CLIENTS = Math.min(500, arg('clients', 50));
const TARGET_P95_MS = 100;
// The whole load phase stops here even if the server hangs, so the check stays bounded.
const MAX_LOAD_MS = 120_000;

function request(agent: http.Agent, port: number, method: string, pathName: string, headers: Record<string, string>, body?: unknown): Promise<{ status: number; headers: http.IncomingHttpHeaders; text: string }> {
  return new Promise((resolve, reject) => {
    const data = body === undefined ? undefined : JSON.stringify(body);
    const req = http.request(
      { host: '127.0.0.1', port, method, path: pathName, agent, headers: { accept: 'application/json', 'x-rotaloom-csrf': '1', ...(data ? { 'content-type': 'application/json', 'content-length': String(Buffer.byteLength(data)) } : {}), ...headers } },
      (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, text: Buffer.concat(chunks).toString('utf8') }));
      },
    );
    req.setTimeout(10_000, () => req.destroy(new Error('request timed out after 10 s')));
    req.on('error', reject);
    if (data) req.write(data);
    req.end();
  });
}

const percentile = (sorted: number[], p: number) => sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))];

async function main(): Promise<number> {
  const tmp = mkdtempSync(path.join(os.tmpdir(), 'rotaloom-bench-'));
  const cleanups: Array<() => Promise<unknown>> = [];
  try {
    const dbPort = await freePort();
    const db = await startMariaDb({ dataDir: path.join(tmp, 'mariadb'), port: dbPort, log: () => {} });
    cleanups.push(() => db.stop());
    // The run is a job on the queue (server/queue): a throwaway Redis beside the throwaway MariaDB.
    const redis = await startRedis({ dataDir: path.join(tmp, 'redis'), port: await freePort(), log: () => {} });
    cleanups.push(() => redis.stop());
    const env = readEnv({ ...process.env, NODE_ENV: 'test', ROTALOOM_DB_PORT: String(dbPort), ROTALOOM_DB_HOST: '127.0.0.1', ROTALOOM_DB_NAME: 'rotaloom_bench', ROTALOOM_REDIS_URL: redis.url });
    const sequelize = await prepareDatabase(env.db, () => {});
    cleanups.push(() => sequelize.close());
    cleanups.push(() => closeQueues(sequelize));
    const server: Server = await new Promise((resolve) => {
      const s = createApp({ env, sequelize }).listen(0, '127.0.0.1', () => resolve(s));
    });
    cleanups.push(() => new Promise((resolve) => server.close(resolve)));
    const port = (server.address() as { port: number }).port;

    // Sign in as the demo coordinator; every client reuses the session cookie.
    const setup = new http.Agent({ keepAlive: false });
    const signIn = await request(setup, port, 'POST', '/api/auth/sign-in', {}, { email: 'coordinator@willowmere.example', password: DEMO_PASSWORD });
    if (signIn.status !== 200) throw new Error(`sign-in failed: ${signIn.status} ${signIn.text}`);
    const cookie = (signIn.headers['set-cookie'] ?? []).map((c) => c.split(';')[0]).join('; ');
    const roster = (await Roster.findOne({ order: [['id', 'ASC']] }))!;
    const start = await request(setup, port, 'POST', `/api/rosters/${roster.id}/runs`, { cookie }, { timeLimitSeconds: 5, seed: 1 });
    if (start.status !== 202) throw new Error(`starting the run failed: ${start.status} ${start.text}`);
    const runId = (JSON.parse(start.text) as { id: number }).id;
    const worker = new RunWorker(sequelize, { name: 'bench' });
    await worker.tick();
    await worker.stop();
    const first = await request(setup, port, 'GET', `/api/runs/${runId}`, { cookie });
    const run = JSON.parse(first.text) as { status: string; assignments: unknown[] };
    if (run.status !== 'done') throw new Error(`the run did not finish: ${first.text.slice(0, 300)}`);
    const days = Math.round((Date.parse(roster.periodEnd) - Date.parse(roster.periodStart)) / 86_400_000) + 1;
    console.log(`roster "${roster.name}": ${days} days, ${run.assignments.length} seats; answer ${(Buffer.byteLength(first.text) / 1024).toFixed(1)} KiB`);

    const elu0 = performance.eventLoopUtilization();
    const load = await new Promise<{ latencies: number[]; failures: Record<string, number>; seconds: number }>((resolve, reject) => {
      const worker = new Worker(new URL('./load-client.mjs', import.meta.url), {
        workerData: { port, path: `/api/runs/${runId}`, cookie, requests: REQUESTS, clients: CLIENTS, maxLoadMs: MAX_LOAD_MS },
      });
      worker.once('message', resolve);
      worker.once('error', reject);
      worker.once('exit', (code) => (code === 0 ? undefined : reject(new Error(`load client stopped with code ${code}`))));
    });
    const { latencies, seconds } = load;
    // Busy time of the server's event loop per answer: less sensitive to other load than latency.
    const busyMsPerRequest = performance.eventLoopUtilization(elu0).active / Math.max(1, latencies.length);
    const failures = new Map(Object.entries(load.failures));

    const sorted = latencies.slice().sort((a, b) => a - b);
    const failed = [...failures.values()].reduce((a, b) => a + b, 0);
    const p95 = percentile(sorted, 95);
    console.log(`GET /api/runs/:id, ${CLIENTS} concurrent clients, ${latencies.length} answers in ${seconds.toFixed(1)} s (loopback, ${os.cpus().length} cores)`);
    console.log(`  requests/s  ${(latencies.length / seconds).toFixed(0)}`);
    console.log(`  latency ms  p50 ${percentile(sorted, 50).toFixed(1)}  p95 ${p95.toFixed(1)}  p99 ${percentile(sorted, 99).toFixed(1)}  max ${sorted[sorted.length - 1].toFixed(1)}`);
    console.log(`  server      ${busyMsPerRequest.toFixed(2)} ms of event-loop time per answer`);
    console.log(`  failed      ${failed}${failed ? ` (${[...failures].map(([k, v]) => `${k}: ${v}`).join(', ')})` : ''}`);
    console.log(`  target      p95 under ${TARGET_P95_MS} ms: ${p95 < TARGET_P95_MS ? 'met' : 'NOT met'}`);
    return failed === 0 && p95 < TARGET_P95_MS && latencies.length === REQUESTS ? 0 : 1;
  } finally {
    for (const c of cleanups.reverse()) await c().catch((err) => console.error(err));
    rmSync(tmp, { recursive: true, force: true });
  }
}

main().then(
  (code) => process.exit(code),
  (err) => {
    console.error(`bench:api failed: ${err instanceof Error ? err.message : String(err)}`);
    process.exit(1);
  },
);
