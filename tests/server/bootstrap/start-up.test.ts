import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, renameSync, rmSync } from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { rootDir } from '../../../server/env';
import { freePort, startMariaDb, type MariaDbServer } from '../../../server/bootstrap/mariadb';
import { startRedis, type RedisServer } from '../../../server/bootstrap/redis';
import { assertPortFree, listenHttp } from '../../../server/bootstrap/listen';
import { MARKER_FILE, thisCheckout } from '../../../server/bootstrap/checkout-marker';

/**
 * Issue 13 item 10: `npm start` says it runs only when it does. "Busy" is what the operating system
 * says: a second listen on a bound address fails with EADDRINUSE (POSIX bind(2), Node's net docs);
 * a folder's owner is what the server itself reports (MariaDB's @@datadir, Redis's CONFIG GET dir).
 */
const quiet = () => {};

/** A plain TCP listener standing in for "another program owns the port". */
async function holdPort(): Promise<{ port: number; close: () => Promise<void> }> {
  const server = net.createServer((socket) => socket.destroy());
  const port = await freePort();
  await new Promise<void>((resolve) => server.listen(port, '127.0.0.1', resolve));
  return { port, close: () => new Promise((resolve) => server.close(() => resolve())) };
}

describe('start-up: the app port', () => {
  it('refuses a busy port with words naming it and ROTALOOM_PORT', async () => {
    const held = await holdPort();
    try {
      await expect(assertPortFree(held.port, '127.0.0.1')).rejects.toThrow(`Port ${held.port} on 127.0.0.1 is already in use`);
      await expect(listenHttp(() => {}, held.port, '127.0.0.1')).rejects.toThrow(/ROTALOOM_PORT=<port>/);
      const port = await freePort();
      const server = await listenHttp((_req, res) => res.end('ok'), port, '127.0.0.1');
      await new Promise((resolve) => server.close(resolve));
    } finally {
      await held.close();
    }
  });

  it('npm start stops with a non-zero exit before starting anything, and never says it is running', async () => {
    const held = await holdPort();
    const dataDir = mkdtempSync(path.join(os.tmpdir(), 'rotaloom-start-busy-'));
    try {
      const env = { ...process.env, ROTALOOM_PORT: String(held.port), ROTALOOM_DATA_DIR: dataDir, ROTALOOM_DB_PORT: String(await freePort()) };
      const child = spawn(path.join(rootDir, 'node_modules', '.bin', 'tsx'), [path.join(rootDir, 'server/bootstrap/run-start.ts')], { cwd: rootDir, env });
      let out = '';
      child.stdout.on('data', (c) => (out += c));
      child.stderr.on('data', (c) => (out += c));
      const code = await new Promise<number | null>((resolve) => child.once('exit', resolve));
      expect(code).not.toBe(0);
      expect(out).toContain(`Port ${held.port} on 127.0.0.1 is already in use`);
      expect(out).not.toContain('Rotaloom is running');
      // Nothing was started: no MariaDB data folder was made.
      expect(existsSync(path.join(dataDir, 'mariadb'))).toBe(false);
    } finally {
      await held.close();
      rmSync(dataDir, { recursive: true, force: true });
    }
  }, 60_000);
});

describe('start-up: a MariaDB already on the port', () => {
  const other = '/srv/some-other-checkout';
  let tmp: string;
  let port: number;
  let db: MariaDbServer;

  beforeAll(async () => {
    tmp = mkdtempSync(path.join(os.tmpdir(), 'rotaloom-start-db-'));
    port = await freePort();
    // A server started by "another checkout": its data folder names that checkout.
    db = await startMariaDb({ dataDir: path.join(tmp, 'other'), port, checkout: other, log: quiet });
  }, 120_000);

  afterAll(async () => {
    await db?.stop();
    rmSync(tmp, { recursive: true, force: true });
  });

  it('marks a new data folder with the absolute path of its checkout', () => {
    expect(db.reused).toBe(false);
    expect(readFileSync(path.join(tmp, 'other', MARKER_FILE), 'utf8').trim()).toBe(other);
  });

  it('reuses its own data folder', async () => {
    const again = await startMariaDb({ dataDir: path.join(tmp, 'other'), port, checkout: other, log: quiet });
    expect(again.reused).toBe(true);
  });

  it("refuses another checkout's, even when asked to use a running one", async () => {
    for (const useRunning of [false, true]) {
      await expect(startMariaDb({ dataDir: path.join(tmp, 'mine'), port, useRunning, log: quiet })).rejects.toThrow(
        `belongs to the checkout at ${other}`,
      );
    }
  });

  it("never starts a server on another checkout's data folder", async () => {
    const elsewhere = await freePort();
    await expect(startMariaDb({ dataDir: path.join(tmp, 'other'), port: elsewhere, log: quiet })).rejects.toThrow(/ROTALOOM_DATA_DIR/);
  });

  it('uses a server no checkout made only when ROTALOOM_DB_USE_RUNNING asks', async () => {
    const marker = path.join(tmp, 'other', MARKER_FILE);
    renameSync(marker, `${marker}.away`);
    try {
      await expect(startMariaDb({ dataDir: path.join(tmp, 'mine'), port, log: quiet })).rejects.toThrow(/ROTALOOM_DB_USE_RUNNING=1/);
      const asked = await startMariaDb({ dataDir: path.join(tmp, 'mine'), port, useRunning: true, log: quiet });
      expect(asked.reused).toBe(true);
    } finally {
      renameSync(`${marker}.away`, marker);
    }
  });

  it('refuses a port held by a program that is not MariaDB', async () => {
    const held = await holdPort();
    try {
      await expect(startMariaDb({ dataDir: path.join(tmp, 'mine'), port: held.port, log: quiet })).rejects.toThrow(/not a MariaDB/);
    } finally {
      await held.close();
    }
  });
});

describe('start-up: a Redis already on the port', () => {
  const other = '/srv/some-other-checkout';
  let tmp: string;
  let redis: RedisServer;

  beforeAll(async () => {
    tmp = mkdtempSync(path.join(os.tmpdir(), 'rotaloom-start-redis-'));
    redis = await startRedis({ dataDir: path.join(tmp, 'other'), port: await freePort(), checkout: other, log: quiet });
  });

  afterAll(async () => {
    await redis?.stop();
    rmSync(tmp, { recursive: true, force: true });
  });

  it("reuses its own and refuses another checkout's queue", async () => {
    const again = await startRedis({ dataDir: path.join(tmp, 'other'), port: redis.port, checkout: other, log: quiet });
    expect(again.reused).toBe(true);
    expect(thisCheckout()).not.toBe(other);
    await expect(startRedis({ dataDir: path.join(tmp, 'mine'), port: redis.port, log: quiet })).rejects.toThrow(`belongs to the checkout at ${other}`);
  });
});
