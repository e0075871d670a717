import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';

const searchPath = ['/usr/sbin', '/usr/bin', '/usr/local/sbin', '/usr/local/bin', '/sbin', '/bin'];

export function findExecutable(name: string): string | null {
  const dirs = [...(process.env.PATH ?? '').split(':'), ...searchPath];
  for (const dir of dirs) {
    const candidate = `${dir}/${name}`;
    if (dir && existsSync(candidate)) return candidate;
  }
  return null;
}

let aptUpdated = false;

/**
 * Installs Debian packages whose executable is missing. Only root may; anyone else gets the
 * exact command to run instead of a half-started stack.
 */
export function ensureDebianPackages(wanted: Array<{ executable: string; pkg: string }>): void {
  const missing = wanted.filter((w) => !findExecutable(w.executable));
  if (missing.length === 0) return;
  const pkgs = missing.map((m) => m.pkg).join(' ');
  if (typeof process.getuid === 'function' && process.getuid() !== 0) {
    throw new Error(`Missing ${missing.map((m) => m.executable).join(', ')}. Install with: sudo apt-get update && sudo apt-get install -y ${pkgs}`);
  }
  console.log(`[rotaloom] installing Debian packages: ${pkgs} …`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  if (!aptUpdated) {
    const update = spawnSync('apt-get', ['update'], { stdio: 'inherit', env });
    if (update.status !== 0) throw new Error('apt-get update failed; see above');
    aptUpdated = true;
  }
  const install = spawnSync('apt-get', ['install', '-y', '--no-install-recommends', ...missing.map((m) => m.pkg)], { stdio: 'inherit', env });
  if (install.status !== 0) throw new Error(`apt-get install ${pkgs} failed; see above`);
}

export const MARIADB = [
  { executable: 'mariadbd', pkg: 'mariadb-server' },
  { executable: 'mariadb-install-db', pkg: 'mariadb-server' },
];
/** The queue of solve jobs (server/queue) runs on Redis; Debian's package is redis-server. */
export const REDIS = [{ executable: 'redis-server', pkg: 'redis-server' }];
export const CHROMIUM = [{ executable: 'chromium', pkg: 'chromium' }];
