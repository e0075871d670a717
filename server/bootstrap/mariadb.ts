import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, openSync, readFileSync, closeSync } from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import mariadb from 'mariadb';
import { findExecutable } from './system-packages';
import { claimDataDir, judgeRunningServer, thisCheckout } from './checkout-marker';

export interface MariaDbServer {
  port: number;
  dataDir: string;
  /** True when a server from an earlier run already answered on the port and was reused. */
  reused: boolean;
  stop(): Promise<void>;
}

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.unref();
    srv.on('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const { port } = srv.address() as net.AddressInfo;
      srv.close(() => resolve(port));
    });
  });
}

async function answers(port: number): Promise<boolean> {
  return (await runningDataDir(port)) !== undefined;
}

/** The data folder of the MariaDB on the port; undefined when none we can sign in to answers. */
async function runningDataDir(port: number): Promise<string | null | undefined> {
  try {
    const conn = await mariadb.createConnection({ host: '127.0.0.1', port, user: 'root', password: '', connectTimeout: 1_000 });
    try {
      const rows = (await conn.query('SELECT @@datadir AS dir')) as Array<{ dir: string | null }>;
      return rows[0]?.dir ? path.resolve(rows[0].dir) : null;
    } finally {
      await conn.end();
    }
  } catch {
    return undefined;
  }
}

/** Whether anything accepts connections on the loopback port. */
function portTaken(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = net.connect({ host: '127.0.0.1', port });
    socket.setTimeout(1_000, () => (socket.destroy(), resolve(true)));
    socket.once('connect', () => (socket.destroy(), resolve(true)));
    socket.once('error', (err: NodeJS.ErrnoException) => resolve(err.code !== 'ECONNREFUSED'));
  });
}

const isRoot = () => typeof process.getuid === 'function' && process.getuid() === 0;

function tail(file: string, lines = 15): string {
  if (!existsSync(file)) return '(no log)';
  return readFileSync(file, 'utf8').trimEnd().split('\n').slice(-lines).join('\n');
}

/**
 * Starts MariaDB on loopback with its own data folder (created on first use, marked with the
 * checkout's path) and waits until it accepts connections. A server already on the port is used
 * only when its folder is this checkout's, or, for one no checkout made, when `useRunning` says so.
 * The server runs in its own process group so a terminal Ctrl-C reaches us first and we shut it
 * down cleanly.
 */
export async function startMariaDb(options: {
  dataDir: string;
  port: number;
  log?: (line: string) => void;
  /** ROTALOOM_DB_USE_RUNNING=1: the user asked for the MariaDB already on the port. */
  useRunning?: boolean;
  /** Whose data folders these are; this checkout unless a test says otherwise. */
  checkout?: string;
}): Promise<MariaDbServer> {
  const log = options.log ?? ((line: string) => console.log(`[mariadb] ${line}`));
  const { dataDir, port } = options;
  const checkout = options.checkout ?? thisCheckout();
  const runningDir = await runningDataDir(port);
  if (runningDir !== undefined) {
    const settings = { portSetting: 'ROTALOOM_DB_PORT', useHint: 'ROTALOOM_DB_USE_RUNNING=1' };
    log(judgeRunningServer({ what: 'MariaDB', port, runningDir, ownDataDir: dataDir, checkout, useRunning: options.useRunning ?? false, ...settings }));
    return { port, dataDir, reused: true, stop: async () => {} };
  }
  if (await portTaken(port)) {
    throw new Error(
      `Port ${port} on 127.0.0.1 is taken by a program that is not a MariaDB we can sign in to. Stop it, or choose another port with ROTALOOM_DB_PORT=<port>.`,
    );
  }
  claimDataDir(dataDir, checkout);
  const userArgs = isRoot() ? ['--user=root'] : [];
  if (!existsSync(path.join(dataDir, 'mysql'))) {
    log(`creating a data folder in ${dataDir}`);
    const installDb = findExecutable('mariadb-install-db') ?? 'mariadb-install-db';
    const init = spawnSync(
      installDb,
      ['--no-defaults', `--datadir=${dataDir}`, ...userArgs, '--auth-root-authentication-method=normal', '--skip-test-db'],
      { encoding: 'utf8' },
    );
    if (init.status !== 0) throw new Error(`mariadb-install-db failed:\n${init.stdout}\n${init.stderr}`);
  }
  // Unix socket paths are limited to ~107 bytes; deep checkouts put it in the temp folder instead.
  let socket = path.join(dataDir, 'mariadb.sock');
  if (socket.length > 100) socket = path.join(os.tmpdir(), `rotaloom-mariadb-${port}.sock`);
  const errorLog = path.join(dataDir, 'mariadb-error.log');
  const out = openSync(errorLog, 'a');
  const child: ChildProcess = spawn(
    findExecutable('mariadbd') ?? 'mariadbd',
    [
      '--no-defaults',
      `--datadir=${dataDir}`,
      `--socket=${socket}`,
      `--port=${port}`,
      '--bind-address=127.0.0.1',
      `--pid-file=${path.join(dataDir, 'mariadb.pid')}`,
      '--skip-name-resolve',
      '--innodb-buffer-pool-size=128M',
      '--innodb-flush-log-at-trx-commit=2',
      '--max-connections=200',
      ...userArgs,
    ],
    { detached: true, stdio: ['ignore', out, out] },
  );
  closeSync(out);
  let exited: number | null = null;
  const exit = new Promise<void>((resolve) =>
    child.once('exit', (code) => {
      exited = code ?? -1;
      resolve();
    }),
  );
  const deadline = Date.now() + 60_000;
  while (!(await answers(port))) {
    if (exited !== null) throw new Error(`MariaDB stopped while starting (exit ${exited}). Last lines of ${errorLog}:\n${tail(errorLog)}`);
    if (Date.now() > deadline) {
      child.kill('SIGKILL');
      throw new Error(`MariaDB did not answer on port ${port} within 60 s. Last lines of ${errorLog}:\n${tail(errorLog)}`);
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  log(`running on 127.0.0.1:${port} (data in ${dataDir})`);
  return {
    port,
    dataDir,
    reused: false,
    async stop() {
      if (exited !== null) return;
      child.kill('SIGTERM');
      const timer = setTimeout(() => child.kill('SIGKILL'), 30_000);
      await exit;
      clearTimeout(timer);
      log('stopped');
    },
  };
}
