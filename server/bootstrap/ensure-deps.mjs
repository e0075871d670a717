// Plain Node with no dependencies: it runs before node_modules exists.
import { existsSync, statSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const rootDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');

function mtime(file) {
  return existsSync(file) ? statSync(file).mtimeMs : 0;
}

/**
 * npm's own record of the last install; older than the lock file means the dependencies changed
 * since (a pull, a branch switch). package.json alone is not compared: editing a script there
 * must not reinstall everything.
 */
function dependenciesStale() {
  const installed = path.join(rootDir, 'node_modules', '.package-lock.json');
  if (!existsSync(installed)) return true;
  return mtime(path.join(rootDir, 'package-lock.json')) > mtime(installed);
}

export function ensureNpmDependencies() {
  if (!dependenciesStale()) return;
  const hasLock = existsSync(path.join(rootDir, 'package-lock.json'));
  const args = hasLock ? ['ci', '--no-audit', '--no-fund'] : ['install', '--no-audit', '--no-fund'];
  console.log(`[rotaloom] installing npm dependencies (npm ${args[0]}) …`);
  const result = spawnSync('npm', args, { cwd: rootDir, stdio: 'inherit' });
  if (result.status !== 0) {
    console.error('[rotaloom] npm could not install the dependencies; see the messages above.');
    process.exit(result.status ?? 1);
  }
}

/** Runs a TypeScript entry with the project's tsx, passing signals through and exiting with its code. */
export function runTs(entry, args = []) {
  const tsx = path.join(rootDir, 'node_modules', '.bin', 'tsx');
  // The child shares our terminal, so Ctrl-C reaches it directly; we only wait for it to finish.
  process.on('SIGINT', () => {});
  process.on('SIGTERM', () => {});
  const result = spawnSync(tsx, [path.join(rootDir, entry), ...args], { cwd: rootDir, stdio: 'inherit' });
  process.exit(result.status ?? (result.signal ? 1 : 0));
}
