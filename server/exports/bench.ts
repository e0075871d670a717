import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import bcrypt from 'bcryptjs';
import { readEnv, rootDir } from '../env';
import { startMariaDb, freePort } from '../bootstrap/mariadb';
import { startRedis } from '../bootstrap/redis';
import { prepareDatabase } from '../bootstrap/database';
import { startWorkerProcess, type WorkerProcess } from '../bootstrap/worker-process';
import { Membership, Person, User, Workspace } from '../db/models';
import { AssignmentRow, Roster, RunRow, SeatRow, ShiftRow } from '../rosters/models';
import { grantTeamPlan } from '../billing/service';

/**
 * `npx tsx server/exports/bench.ts`: what a large export costs the API process. A throwaway
 * MariaDB and Redis, one API process and one worker process; rosters of 60 people × 13 weeks and
 * 200 people × 4 weeks (and a small one for contrast), each with a finished run and published.
 * Every export (grid PDF, roster CSV and iCalendar, people CSV) is fetched as the web client
 * does: a 200 is the file; a 202 is followed to its file. It prints wall time, and the CPU time
 * the API and the worker process spent on it (utime + stime from /proc/<pid>/stat), median of 3.
 */
const PASSWORD = 'bench password 42';
const REPEAT = 3;

const CLK_TCK = 100; // Linux USER_HZ: /proc/<pid>/stat counts CPU time in 1/100 s
function cpuMs(pid: number): number {
  // Fields after the command's closing parenthesis: state is field 3, utime 14, stime 15 (proc(5)).
  const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
  const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
  return ((Number(fields[11]) + Number(fields[12])) * 1000) / CLK_TCK;
}

function startApi(env: NodeJS.ProcessEnv, port: number): Promise<ChildProcess> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ['--import', 'tsx', path.join(rootDir, 'server', 'index.ts')], { cwd: rootDir, env: { ...env, ROTALOOM_PORT: String(port) }, stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    child.stdout!.on('data', (c: Buffer) => {
      out += c.toString();
      if (out.includes('listening')) resolve(child);
    });
    child.stderr!.on('data', (c: Buffer) => (out += c.toString()));
    child.once('exit', (code) => reject(new Error(`API process stopped (${code}): ${out}`)));
  });
}

interface Size {
  label: string;
  people: number;
  days: number;
  /** Seats per day: early, late, night. */
  seats: [number, number, number];
}
const SIZES: Size[] = [
  { label: '10 people × 4 weeks', people: 10, days: 28, seats: [2, 2, 1] },
  { label: '30 people × 8 weeks', people: 30, days: 56, seats: [3, 3, 1] },
  { label: '60 people × 13 weeks', people: 60, days: 91, seats: [5, 4, 2] },
  { label: '200 people × 4 weeks', people: 200, days: 28, seats: [16, 14, 8] },
  { label: '200 people × 52 weeks', people: 200, days: 364, seats: [16, 14, 8] },
];

const addDays = (iso: string, n: number) => new Date(Date.parse(`${iso}T00:00:00Z`) + n * 86_400_000).toISOString().slice(0, 10);

/** A published roster with a finished run, written straight to the tables (the API would take minutes to build 200 people). */
async function makeRoster(workspaceId: number, size: Size, n: number): Promise<{ rosterId: number; runId: number; draftRunId: number }> {
  const people = await Person.bulkCreate(Array.from({ length: size.people }, (_, i) => ({ workspaceId, name: `Bench ${n}.${String(i).padStart(3, '0')} Holloway`, contractedHours: 30, skills: [] })) as never[]);
  const start = '2027-03-01';
  const end = addDays(start, size.days - 1);
  const roster = await Roster.create({ workspaceId, name: `Bench ${size.label}`, periodStart: start, periodEnd: end, timeZone: 'Europe/London', rules: { rules: [] } as never, status: 'published' });
  const shifts: Array<{ label: string; startsLocal: string; endsLocal: string; count: number }> = [];
  for (let d = 0; d < size.days; d++) {
    const day = addDays(start, d);
    const next = addDays(start, d + 1);
    shifts.push({ label: 'early', startsLocal: `${day}T07:00:00`, endsLocal: `${day}T15:00:00`, count: size.seats[0] });
    shifts.push({ label: 'late', startsLocal: `${day}T14:00:00`, endsLocal: `${day}T22:00:00`, count: size.seats[1] });
    shifts.push({ label: 'night', startsLocal: `${day}T21:30:00`, endsLocal: `${next}T07:30:00`, count: size.seats[2] });
  }
  const shiftRows = await ShiftRow.bulkCreate(shifts.map((s) => ({ workspaceId, rosterId: roster.id, label: s.label, startsLocal: s.startsLocal, endsLocal: s.endsLocal })));
  const seatRows = await SeatRow.bulkCreate(shiftRows.flatMap((s, i) => Array.from({ length: shifts[i].count }, (_, position) => ({ workspaceId, shiftId: s.id, skillId: null, position }))));
  const run = await RunRow.create({ workspaceId, rosterId: roster.id, status: 'done', parameters: { timeLimitSeconds: 1, seed: 1 }, rosterVersion: roster.version, result: { feasible: true } as object, finishedAt: new Date() });
  await AssignmentRow.bulkCreate(seatRows.map((s, i) => ({ workspaceId, runId: run.id, seatId: s.id, personId: people[i % people.length].id, pinned: false })));
  await Roster.update({ publishedRunId: run.id, publishedAt: new Date() }, { where: { id: roster.id } });
  // A later run, not published: its files are written from the tables as they are, not from the snapshot.
  const draft = await RunRow.create({ workspaceId, rosterId: roster.id, status: 'done', parameters: { timeLimitSeconds: 1, seed: 2 }, rosterVersion: roster.version, result: { feasible: true } as object, finishedAt: new Date() });
  await AssignmentRow.bulkCreate(seatRows.map((s, i) => ({ workspaceId, runId: draft.id, seatId: s.id, personId: people[(i + 1) % people.length].id, pinned: false })));
  return { rosterId: roster.id, runId: run.id, draftRunId: draft.id };
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor((xs.length - 1) / 2)];

async function main(): Promise<number> {
  const tmp = mkdtempSync(path.join(os.tmpdir(), 'rotaloom-export-bench-'));
  const cleanups: Array<() => Promise<unknown>> = [];
  const say = (line: string) => console.log(`[bench:exports] ${line}`);
  try {
    const [dbPort, redisPort, apiPort] = [await freePort(), await freePort(), await freePort()];
    const [db, redis] = await Promise.all([
      startMariaDb({ dataDir: path.join(tmp, 'mariadb'), port: dbPort, log: () => {} }).then((d) => (cleanups.push(() => d.stop()), d)),
      startRedis({ dataDir: path.join(tmp, 'redis'), port: redisPort, log: () => {} }).then((r) => (cleanups.push(() => r.stop()), r)),
    ]);
    const childEnv: NodeJS.ProcessEnv = { ...process.env, NODE_ENV: 'test', ROTALOOM_DB_HOST: '127.0.0.1', ROTALOOM_DB_PORT: String(db.port), ROTALOOM_DB_NAME: 'rotaloom_export_bench', ROTALOOM_REDIS_URL: redis.url, ROTALOOM_SIGNIN_MAX_PER_ADDRESS: '1000' };
    const sequelize = await prepareDatabase(readEnv(childEnv).db, () => {});
    cleanups.push(() => sequelize.close());

    const w = await Workspace.create({ name: 'Bench House', timeZone: 'Europe/London' });
    await grantTeamPlan(w.id, 0);
    const u = await User.create({ email: 'bench@example.test', displayName: 'Bench', passwordHash: bcrypt.hashSync(PASSWORD, 8), emailVerified: true });
    await Membership.create({ workspaceId: w.id, userId: u.id, role: 'coordinator' });
    const rosters = [];
    for (const [i, size] of SIZES.entries()) rosters.push({ size, ...(await makeRoster(w.id, size, i)) });

    const api = await startApi(childEnv, apiPort);
    cleanups.push(async () => api.kill('SIGTERM'));
    const worker: WorkerProcess = startWorkerProcess(childEnv, { name: 'bench-worker', log: () => {} });
    cleanups.push(() => worker.stop());
    await new Promise((r) => setTimeout(r, 4000));
    say(`1 API process (pid ${api.pid}), 1 worker process (pid ${worker.child.pid}); ${os.cpus().length} cores`);

    const base = `http://127.0.0.1:${apiPort}`;
    const signIn = await fetch(`${base}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json', 'x-rotaloom-csrf': '1' }, body: JSON.stringify({ email: u.email, password: PASSWORD }) });
    if (signIn.status !== 200) throw new Error(`sign-in: ${signIn.status} ${await signIn.text()}`);
    const cookie = signIn.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');

    /** One export as the web client fetches it; the bytes, which path answered, and the time. */
    const fetchExport = async (url: string) => {
      const t = performance.now();
      let res = await fetch(`${base}${url}`, { headers: { cookie, accept: '*/*' } });
      let path = 'sync';
      if (res.status === 202) {
        path = 'job';
        const { location } = (await res.json()) as { location: string };
        for (;;) {
          const status = (await (await fetch(`${base}${location}`, { headers: { cookie } })).json()) as { export: { status: string; fileUrl: string; error?: string } };
          if (status.export.status === 'done') {
            res = await fetch(`${base}${status.export.fileUrl}`, { headers: { cookie } });
            break;
          }
          if (status.export.status === 'failed') throw new Error(`${url}: ${status.export.error}`);
          await new Promise((r) => setTimeout(r, 250));
        }
      }
      if (res.status !== 200) throw new Error(`${url}: ${res.status} ${await res.text()}`);
      const bytes = Buffer.from(await res.arrayBuffer()).length;
      return { path, bytes, ms: performance.now() - t };
    };

    const rows: string[] = [];
    for (const r of rosters) {
      const cases: Array<[string, string]> = [
        ['grid PDF', `/api/rosters/${r.rosterId}/roster.pdf?runId=${r.runId}&days=7`],
        ['roster CSV', `/api/rosters/${r.rosterId}/roster.csv`],
        ['roster iCalendar', `/api/rosters/${r.rosterId}/roster.ics`],
        ['run CSV', `/api/rosters/${r.rosterId}/roster.csv?runId=${r.draftRunId}`],
        ['run iCalendar', `/api/rosters/${r.rosterId}/roster.ics?runId=${r.draftRunId}`],
      ];
      // Warm up once (the first export of a published roster writes its snapshot; JIT).
      for (const [, url] of cases) await fetchExport(url);
      for (const [what, url] of cases) {
        const samples: Array<{ ms: number; api: number; worker: number; bytes: number; path: string }> = [];
        for (let k = 0; k < REPEAT; k++) {
          const a0 = cpuMs(api.pid!);
          const w0 = cpuMs(worker.child.pid!);
          const got = await fetchExport(url);
          samples.push({ ms: got.ms, api: cpuMs(api.pid!) - a0, worker: cpuMs(worker.child.pid!) - w0, bytes: got.bytes, path: got.path });
        }
        const line = `${r.size.label.padEnd(22)} ${what.padEnd(17)} ${samples[0].path.padEnd(5)} ${String(Math.round(median(samples.map((s) => s.ms)))).padStart(6)} ms   API CPU ${String(Math.round(median(samples.map((s) => s.api)))).padStart(5)} ms   worker CPU ${String(Math.round(median(samples.map((s) => s.worker)))).padStart(5)} ms   ${(samples[0].bytes / 1024).toFixed(0).padStart(5)} KiB`;
        rows.push(line);
        say(line);
      }
    }
    const people = await Person.count({ where: { workspaceId: w.id } });
    await fetchExport('/api/people/export');
    const samples = [];
    for (let k = 0; k < REPEAT; k++) {
      const a0 = cpuMs(api.pid!);
      const w0 = cpuMs(worker.child.pid!);
      const got = await fetchExport('/api/people/export');
      samples.push({ ...got, api: cpuMs(api.pid!) - a0, worker: cpuMs(worker.child.pid!) - w0 });
    }
    say(`${`${people} people`.padEnd(22)} ${'people CSV'.padEnd(17)} ${samples[0].path.padEnd(5)} ${String(Math.round(median(samples.map((s) => s.ms)))).padStart(6)} ms   API CPU ${String(Math.round(median(samples.map((s) => s.api)))).padStart(5)} ms   worker CPU ${String(Math.round(median(samples.map((s) => s.worker)))).padStart(5)} ms   ${(samples[0].bytes / 1024).toFixed(0).padStart(5)} KiB`);
    return 0;
  } finally {
    for (const c of cleanups.reverse()) await c().catch(() => {});
    rmSync(tmp, { recursive: true, force: true });
  }
}

main().then(
  (code) => process.exit(code),
  (err) => {
    console.error(err);
    process.exit(1);
  },
);
