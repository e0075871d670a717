import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import bcrypt from 'bcryptjs';
import { readEnv, rootDir } from '../env';
import { startMariaDb, freePort } from '../bootstrap/mariadb';
import { startRedis } from '../bootstrap/redis';
import { prepareDatabase } from '../bootstrap/database';
import { startWorkerProcess, type WorkerProcess } from '../bootstrap/worker-process';
import { Membership, User, Workspace } from '../db/models';
import { RunRow } from '../rosters/models';
import { grantTeamPlan } from '../billing/service';

/**
 * `npm run bench:queue [-- --workers=N]`: the scaled-out deployment on one machine. A throwaway
 * MariaDB and Redis, 2 API processes and N worker processes (1–3, default 2); 12 workspaces send 60
 * runs through both API processes while one of them floods the queue; one worker is killed with
 * -9 in the middle of a run. Prints throughput, time to start per workspace, and what became of
 * the killed worker's run.
 */
const WORKSPACES = 12;
const FLOOD = 27; // the flooding workspace's runs; the other 11 send 3 each: 60 in all
const PER_QUIET = 3;
const TIME_LIMIT_S = 1;
const PASSWORD = 'bench password 42';

const arg = (name: string) => process.argv.find((a) => a.startsWith(`--${name}=`))?.split('=')[1];
const WORKERS = Math.max(1, Math.min(3, Number(arg('workers') ?? 2)));

interface Api {
  port: number;
  child: ChildProcess;
}

function startApi(env: NodeJS.ProcessEnv, port: number): Promise<Api> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ['--import', 'tsx', path.join(rootDir, 'server', 'index.ts')], { cwd: rootDir, env: { ...env, ROTALOOM_PORT: String(port) }, stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    const onData = (c: Buffer) => {
      out += c.toString();
      if (out.includes('listening')) resolve({ port, child });
    };
    child.stdout!.on('data', onData);
    child.stderr!.on('data', (c: Buffer) => (out += c.toString()));
    child.once('exit', (code) => reject(new Error(`API process stopped (${code}): ${out}`)));
  });
}

async function call(api: Api, method: string, url: string, cookie: string, body?: unknown): Promise<{ status: number; json: any; cookie?: string }> {
  const res = await fetch(`http://127.0.0.1:${api.port}${url}`, {
    method,
    headers: { 'content-type': 'application/json', 'x-rotaloom-csrf': '1', cookie },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  const text = await res.text();
  const setCookie = res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
  return { status: res.status, json: text ? JSON.parse(text) : null, cookie: setCookie || undefined };
}

async function rosterFor(api: Api, cookie: string, i: number): Promise<number> {
  for (let p = 0; p < 6; p++) {
    const r = await call(api, 'POST', '/api/people', cookie, { name: `Bench person ${i}.${p}`, contractedHours: 30, skillIds: [] });
    if (r.status !== 201) throw new Error(`person: ${r.status} ${JSON.stringify(r.json)}`);
  }
  const roster = await call(api, 'POST', '/api/rosters', cookie, { name: `Bench ${i}`, periodStart: '2027-03-01', periodEnd: '2027-03-07', timeZone: 'Europe/London' });
  if (roster.status !== 201) throw new Error(`roster: ${roster.status} ${JSON.stringify(roster.json)}`);
  const pattern = await call(api, 'POST', `/api/rosters/${roster.json.id}/patterns`, cookie, {
    label: 'day',
    weekdays: ['mon', 'tue', 'wed', 'thu', 'fri'],
    startTime: '07:00',
    endTime: '15:00',
    seats: [{ skillId: null, count: 2 }],
  });
  if (pattern.status !== 201) throw new Error(`pattern: ${pattern.status} ${JSON.stringify(pattern.json)}`);
  return roster.json.id;
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length ? s[Math.floor((s.length - 1) / 2)] : NaN;
};
const sec = (ms: number) => `${(ms / 1000).toFixed(1)} s`;

async function main(): Promise<number> {
  const tmp = mkdtempSync(path.join(os.tmpdir(), 'rotaloom-queue-bench-'));
  const cleanups: Array<() => Promise<unknown>> = [];
  const say = (line: string) => console.log(`[bench:queue] ${line}`);
  try {
    const [dbPort, redisPort] = [await freePort(), await freePort()];
    const [db, redis] = await Promise.all([
      startMariaDb({ dataDir: path.join(tmp, 'mariadb'), port: dbPort, log: () => {} }).then((d) => (cleanups.push(() => d.stop()), d)),
      startRedis({ dataDir: path.join(tmp, 'redis'), port: redisPort, log: () => {} }).then((r) => (cleanups.push(() => r.stop()), r)),
    ]);
    const childEnv: NodeJS.ProcessEnv = {
      ...process.env,
      NODE_ENV: 'test',
      ROTALOOM_DB_HOST: '127.0.0.1',
      ROTALOOM_DB_PORT: String(db.port),
      ROTALOOM_DB_NAME: 'rotaloom_queue_bench',
      ROTALOOM_REDIS_URL: redis.url,
      ROTALOOM_QUEUE_LOCK_MS: '3000',
      ROTALOOM_SIGNIN_MAX_PER_ADDRESS: '1000',
    };
    const env = readEnv(childEnv);
    const sequelize = await prepareDatabase(env.db, () => {});
    cleanups.push(() => sequelize.close());

    // 12 workspaces on the team plan (cap of 3 runs at once), a coordinator each.
    const hash = bcrypt.hashSync(PASSWORD, 8);
    const accounts: Array<{ workspaceId: number; email: string }> = [];
    for (let i = 0; i < WORKSPACES; i++) {
      const w = await Workspace.create({ name: i === 0 ? 'Flood House' : `Quiet ${i}`, timeZone: 'Europe/London' });
      await grantTeamPlan(w.id, 0);
      const u = await User.create({ email: `bench${i}@example.test`, displayName: `Bench ${i}`, passwordHash: hash, emailVerified: true });
      await Membership.create({ workspaceId: w.id, userId: u.id, role: 'coordinator' });
      accounts.push({ workspaceId: w.id, email: u.email });
    }

    const apis = await Promise.all([0, 1].map(async () => startApi(childEnv, await freePort())));
    for (const api of apis) cleanups.push(async () => api.child.kill('SIGTERM'));
    const workers: WorkerProcess[] = [];
    const startWorker = (name: string) => {
      const w = startWorkerProcess(childEnv, { name, log: () => {} });
      workers.push(w);
      cleanups.push(() => w.stop());
      return w;
    };
    for (let i = 1; i <= WORKERS; i++) startWorker(`worker-${i}`);
    say(`2 API processes (ports ${apis.map((a) => a.port).join(', ')}), ${WORKERS} worker process${WORKERS === 1 ? '' : 'es'}, MariaDB :${db.port}, Redis :${redis.port}; ${os.cpus().length} cores`);

    // Sign in on one API process and use the cookie on both: sessions live in MariaDB, not in a process.
    const sessions: Array<{ workspaceId: number; cookie: string; rosterId: number }> = [];
    for (const [i, a] of accounts.entries()) {
      const signIn = await call(apis[0], 'POST', '/api/auth/sign-in', '', { email: a.email, password: PASSWORD });
      if (signIn.status !== 200 || !signIn.cookie) throw new Error(`sign-in: ${signIn.status} ${JSON.stringify(signIn.json)}`);
      sessions.push({ workspaceId: a.workspaceId, cookie: signIn.cookie, rosterId: await rosterFor(apis[i % 2], signIn.cookie, i) });
    }

    // Watch the rows: when each run was first seen running (the table keeps whole seconds only).
    const postedAt = new Map<number, number>();
    const startedAt = new Map<number, number>();
    const finishedAt = new Map<number, number>();
    let watching = true;
    const watcher = (async () => {
      while (watching) {
        const rows = await RunRow.findAll({ attributes: ['id', 'status'] });
        const now = Date.now();
        for (const r of rows) {
          if (r.status !== 'queued' && !startedAt.has(r.id)) startedAt.set(r.id, now);
          if (['done', 'failed', 'cancelled'].includes(r.status) && !finishedAt.has(r.id)) finishedAt.set(r.id, now);
        }
        await new Promise((r) => setTimeout(r, 100));
      }
    })();

    const post = async (s: (typeof sessions)[number], n: number) => {
      const r = await call(apis[n % 2], 'POST', `/api/rosters/${s.rosterId}/runs`, s.cookie, { timeLimitSeconds: TIME_LIMIT_S, seed: n });
      if (r.status !== 202) throw new Error(`start run: ${r.status} ${JSON.stringify(r.json)}`);
      postedAt.set(r.json.id, Date.now());
      return r.json.id as number;
    };
    const byWorkspace = new Map<number, number[]>();
    const note = (ws: number, id: number) => byWorkspace.set(ws, [...(byWorkspace.get(ws) ?? []), id]);
    const t0 = Date.now();
    // The flood first, then the quiet workspaces' runs a second later, one round at a time.
    for (let n = 0; n < FLOOD; n++) note(sessions[0].workspaceId, await post(sessions[0], n));
    await new Promise((r) => setTimeout(r, 1000));
    for (let round = 0; round < PER_QUIET; round++) {
      for (const s of sessions.slice(1)) note(s.workspaceId, await post(s, 100 + round));
      await new Promise((r) => setTimeout(r, 2000));
    }
    const all = [...postedAt.keys()];

    // Kill one worker with -9 while it is solving, and start a fresh one in its place.
    const victim = workers[0];
    const victimName = 'worker-1';
    const killedRun = await (async () => {
      for (;;) {
        const row = await RunRow.findOne({ where: { status: 'running', claimedBy: victimName } });
        if (row && row.progress) return row.id;
        await new Promise((r) => setTimeout(r, 100));
      }
    })();
    victim.child.kill('SIGKILL');
    const killedAt = Date.now();
    say(`killed ${victimName} (pid ${victim.child.pid}) with -9 while it solved run ${killedRun}`);
    startWorker('worker-replacement');

    const deadline = Date.now() + 15 * 60_000;
    while (all.some((id) => !finishedAt.has(id))) {
      if (Date.now() > deadline) throw new Error('runs did not finish within 15 minutes');
      await new Promise((r) => setTimeout(r, 200));
    }
    const tEnd = Math.max(...all.map((id) => finishedAt.get(id)!));
    watching = false;
    await watcher;

    const rows = await RunRow.findAll({ where: { id: all } });
    const done = rows.filter((r) => r.status === 'done').length;
    const killed = rows.find((r) => r.id === killedRun)!;
    say(`${all.length} runs (${TIME_LIMIT_S} s solve each + marginals) finished in ${sec(tEnd - t0)}: ${((all.length / (tEnd - t0)) * 60_000).toFixed(1)} runs/min; ${done} done, ${all.length - done} not done`);
    say(`killed run ${killedRun}: ${killed.status} on ${killed.claimedBy}, ${sec(finishedAt.get(killedRun)! - killedAt)} after the kill`);
    console.log('');
    console.log('  workspace        runs  1st run: wait to start   median wait   last finished');
    for (const s of sessions) {
      const ids = byWorkspace.get(s.workspaceId) ?? [];
      const waits = ids.map((id) => startedAt.get(id)! - postedAt.get(id)!);
      const name = s === sessions[0] ? 'Flood House' : `Quiet ${sessions.indexOf(s)}`;
      console.log(`  ${name.padEnd(16)} ${String(ids.length).padStart(4)}  ${sec(waits[0]).padStart(22)}  ${sec(median(waits)).padStart(12)}  ${sec(Math.max(...ids.map((id) => finishedAt.get(id)!)) - t0).padStart(14)}`);
    }
    const quietFirst = sessions.slice(1).map((s) => startedAt.get(byWorkspace.get(s.workspaceId)![0])! - postedAt.get(byWorkspace.get(s.workspaceId)![0])!);
    const runLen = median(all.map((id) => finishedAt.get(id)! - startedAt.get(id)!));
    console.log('');
    say(`median run length (start to finish, as seen): ${sec(runLen)}; quiet workspaces' first runs waited median ${sec(median(quietFirst))}, at most ${sec(Math.max(...quietFirst))}, behind ${FLOOD} flood runs`);
    return done === all.length ? 0 : 1;
  } finally {
    for (const c of cleanups.reverse()) await c().catch(() => {});
    rmSync(tmp, { recursive: true, force: true });
  }
}

main().then(
  (code) => process.exit(code),
  (err) => {
    console.error(`[bench:queue] ${err instanceof Error ? err.stack : String(err)}`);
    process.exit(1);
  },
);
