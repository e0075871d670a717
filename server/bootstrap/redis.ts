import { spawn, type ChildProcess } from 'node:child_process';
import { closeSync, existsSync, openSync, readFileSync } from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { findExecutable } from './system-packages';
import { claimDataDir, judgeRunningServer, thisCheckout } from './checkout-marker';

export interface RedisServer {
  port: number;
  url: string;
  /** True when a Redis from an earlier run already answered on the port and was reused. */
  reused: boolean;
  stop(): Promise<void>;
}

/**
 * What answers on a loopback port: nothing, a Redis (PING → +PONG) or some other program.
 * A raw socket, not a client library, so a busy port is told apart from a Redis without retries.
 */
export function probeRedisPort(port: number, timeoutMs = 1000): Promise<'free' | 'redis' | 'other'> {
  return new Promise((resolve) => {
    const socket = net.connect({ host: '127.0.0.1', port });
    let reply = '';
    const done = (what: 'free' | 'redis' | 'other') => {
      socket.destroy();
      resolve(what);
    };
    socket.setTimeout(timeoutMs, () => done('other'));
    socket.once('connect', () => socket.write('PING\r\n'));
    socket.on('data', (chunk) => {
      reply += chunk.toString('latin1');
      if (reply.includes('\r\n')) done(reply.startsWith('+PONG') || reply.startsWith('-NOAUTH') ? 'redis' : 'other');
    });
    socket.once('error', (err: NodeJS.ErrnoException) => done(err.code === 'ECONNREFUSED' ? 'free' : 'other'));
  });
}

/** The working folder of the Redis on the port (CONFIG GET dir), or null when it will not say. */
export function redisDataDir(port: number, timeoutMs = 1000): Promise<string | null> {
  return new Promise((resolve) => {
    const socket = net.connect({ host: '127.0.0.1', port });
    let reply = '';
    const done = (dir: string | null) => {
      socket.destroy();
      resolve(dir);
    };
    socket.setTimeout(timeoutMs, () => done(null));
    socket.once('connect', () => socket.write('CONFIG GET dir\r\n'));
    socket.on('data', (chunk) => {
      reply += chunk.toString('utf8');
      if (reply.startsWith('-')) return done(null);
      // *2 $3 dir $<n> <path>: an array of the name and its value.
      const m = /^\*2\r\n\$3\r\ndir\r\n\$(\d+)\r\n/.exec(reply);
      if (m && reply.length >= m[0].length + Number(m[1])) done(reply.slice(m[0].length, m[0].length + Number(m[1])));
    });
    socket.once('error', () => done(null));
  });
}

function tail(file: string, lines = 15): string {
  if (!existsSync(file)) return '(no log)';
  return readFileSync(file, 'utf8').trimEnd().split('\n').slice(-lines).join('\n');
}

/**
 * Starts Debian's redis-server on loopback with its own data folder, as the queue of solve jobs
 * (server/queue). Append-only persistence and no RDB snapshots: a restart keeps the queued jobs,
 * and nothing is written to the folder Redis was started from. Its own process group, so a
 * terminal Ctrl-C reaches us first and we stop it cleanly.
 */
export async function startRedis(options: {
  dataDir: string;
  port: number;
  log?: (line: string) => void;
  /** Whose data folders these are; this checkout unless a test says otherwise. */
  checkout?: string;
}): Promise<RedisServer> {
  const log = options.log ?? ((line: string) => console.log(`[redis] ${line}`));
  const { dataDir, port } = options;
  const checkout = options.checkout ?? thisCheckout();
  const url = `redis://127.0.0.1:${port}`;
  const seen = await probeRedisPort(port);
  if (seen === 'redis') {
    // Another checkout's queue would hand our runs to its workers, which read another database.
    const runningDir = await redisDataDir(port);
    const settings = { portSetting: 'ROTALOOM_REDIS_PORT', useHint: `ROTALOOM_REDIS_URL=${url}` };
    log(judgeRunningServer({ what: 'Redis', port, runningDir, ownDataDir: dataDir, checkout, useRunning: false, ...settings }));
    return { port, url, reused: true, stop: async () => {} };
  }
  if (seen === 'other') {
    throw new Error(
      `Port ${port} on 127.0.0.1 is taken by a program that is not Redis. Stop it, or choose another port with ROTALOOM_REDIS_PORT=<port>, or point ROTALOOM_REDIS_URL at a Redis you run yourself.`,
    );
  }
  claimDataDir(dataDir, checkout);
  const logFile = path.join(dataDir, 'redis.log');
  const out = openSync(logFile, 'a');
  const child: ChildProcess = spawn(
    findExecutable('redis-server') ?? 'redis-server',
    ['--port', String(port), '--dir', dataDir, '--bind', '127.0.0.1', '--save', '', '--appendonly', 'yes', '--protected-mode', 'yes'],
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
  child.once('error', () => {
    exited ??= -1;
  });
  const deadline = Date.now() + 20_000;
  while ((await probeRedisPort(port, 500)) !== 'redis') {
    if (exited !== null) {
      const last = tail(logFile);
      const busy = /Address already in use/i.test(last) ? ` Port ${port} is in use: choose another with ROTALOOM_REDIS_PORT=<port>.` : '';
      throw new Error(`Redis stopped while starting (exit ${exited}).${busy} Last lines of ${logFile}:\n${last}`);
    }
    if (Date.now() > deadline) {
      child.kill('SIGKILL');
      throw new Error(`Redis did not answer on port ${port} within 20 s. Last lines of ${logFile}:\n${tail(logFile)}`);
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  log(`running on 127.0.0.1:${port} (data in ${dataDir})`);
  return {
    port,
    url,
    reused: false,
    async stop() {
      if (exited !== null) return;
      child.kill('SIGTERM');
      const timer = setTimeout(() => child.kill('SIGKILL'), 15_000);
      await exit;
      clearTimeout(timer);
      log('stopped');
    },
  };
}
