import { existsSync, mkdirSync, readFileSync, realpathSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { rootDir } from '../env';

/** A file in each data folder naming the checkout that made it, so two checkouts never share one. */
export const MARKER_FILE = 'rotaloom-checkout';

/** The checkout's absolute path, symlinks resolved, so one folder reached two ways is still one. */
function canonical(dir: string): string {
  const abs = path.resolve(dir);
  return existsSync(abs) ? realpathSync(abs) : abs;
}

export function thisCheckout(): string {
  return canonical(rootDir);
}

/** The checkout named in a data folder, or null when the folder has no marker (or cannot be read). */
export function checkoutOf(dataDir: string): string | null {
  try {
    const named = readFileSync(path.join(dataDir, MARKER_FILE), 'utf8').trim();
    return named ? canonical(named) : null;
  } catch {
    return null;
  }
}

function foreignMessage(dataDir: string, owner: string, remedy: string): string {
  return `The data folder ${dataDir} belongs to the checkout at ${owner}. Two checkouts must not share one: ${remedy}.`;
}

/** Before starting a server on a folder: refuse another checkout's folder, mark a new or unmarked one as ours. */
export function claimDataDir(dataDir: string, checkout: string): void {
  mkdirSync(dataDir, { recursive: true });
  const owner = checkoutOf(dataDir);
  if (owner && owner !== canonical(checkout)) {
    throw new Error(foreignMessage(dataDir, owner, 'give this checkout a folder of its own with ROTALOOM_DATA_DIR=<folder>'));
  }
  if (!owner) writeFileSync(path.join(dataDir, MARKER_FILE), `${canonical(checkout)}\n`);
}

/**
 * A server already answers on our port. Ours (its folder names this checkout): reuse it. Another
 * checkout's: refuse, even when asked. Not made by any checkout: only when the user asked for it.
 */
export function judgeRunningServer(options: {
  what: string;
  port: number;
  runningDir: string | null;
  /** The folder we were told to use: a server running on it is ours even from before markers. */
  ownDataDir: string;
  checkout: string;
  useRunning: boolean;
  portSetting: string;
  /** How the user asks for a server no checkout made, e.g. "ROTALOOM_DB_USE_RUNNING=1". */
  useHint: string;
}): string {
  const { what, port, runningDir, ownDataDir, checkout, useRunning, portSetting, useHint } = options;
  const owner = runningDir ? checkoutOf(runningDir) : null;
  const where = runningDir ? ` (data in ${runningDir})` : '';
  if (!owner && runningDir && canonical(runningDir) === canonical(ownDataDir)) {
    claimDataDir(ownDataDir, checkout);
    return `${what} already answers on 127.0.0.1:${port} with this checkout's data folder ${runningDir}; using it`;
  }
  if (owner && owner === canonical(checkout)) return `${what} of this checkout already answers on 127.0.0.1:${port}${where}; using it`;
  if (owner) {
    const remedy = `stop that checkout's server, or start one of our own on another port with ${portSetting}=<port>`;
    throw new Error(`The ${what} on 127.0.0.1:${port} is another checkout's. ${foreignMessage(runningDir!, owner, remedy)}`);
  }
  if (useRunning) return `using the ${what} already running on 127.0.0.1:${port}${where}, as asked`;
  throw new Error(
    `A ${what} this checkout did not start already answers on 127.0.0.1:${port}${where}. ` +
      `Use it with ${useHint}, or start one of our own on another port with ${portSetting}=<port>.`,
  );
}
