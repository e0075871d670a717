import { createHash } from 'node:crypto';
import { spawn } from 'node:child_process';
import { existsSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { finishWebBuild } from './web-finish';

/** Everything the web bundle is made from; a change in any of them means a rebuild. */
const INPUTS = ['app', 'components', 'constants', 'hooks', 'shared', 'fonts', 'assets', 'public', 'server/bootstrap/web-finish.ts', 'app.json', 'package-lock.json', 'tsconfig.json', 'metro.config.cjs', 'server/bootstrap/web-build.ts'];
const STAMP = '.rotaloom-build-hash';

/**
 * The environment of every web export (`npm start`, `npm test`, the benches). Metro's tree shaking
 * (still flagged unstable in SDK 57, and it needs the optimised graph) drops the unused exports of
 * ES-module packages: date-fns's index shrinks from 163 KiB to the few functions in use.
 */
export const WEB_BUILD_ENV = {
  CI: '1',
  EXPO_NO_TELEMETRY: '1',
  EXPO_OFFLINE: '1',
  EXPO_UNSTABLE_METRO_OPTIMIZE_GRAPH: '1',
  EXPO_UNSTABLE_TREE_SHAKING: '1',
} as const;

function hashInputs(rootDir: string): string {
  const hash = createHash('sha256');
  const visit = (rel: string) => {
    const abs = path.join(rootDir, rel);
    if (!existsSync(abs)) return;
    if (statSync(abs).isDirectory()) {
      for (const name of readdirSync(abs).sort()) visit(path.join(rel, name));
    } else {
      hash.update(rel).update('\0').update(readFileSync(abs)).update('\0');
    }
  };
  INPUTS.forEach(visit);
  return hash.digest('hex');
}

/**
 * Runs `expo export -p web` into dist/, then the steps after it (fonts in index.html, the service
 * worker), unless the last build was made from the same sources.
 */
export async function buildWebIfChanged(rootDir: string, outDir = path.join(rootDir, 'dist')): Promise<'built' | 'up to date'> {
  const hash = hashInputs(rootDir);
  const stampFile = path.join(outDir, STAMP);
  if (existsSync(path.join(outDir, 'index.html')) && existsSync(stampFile) && readFileSync(stampFile, 'utf8') === hash) {
    return 'up to date';
  }
  console.log('[web] building the web app (expo export -p web) …');
  const started = Date.now();
  await new Promise<void>((resolve, reject) => {
    const child = spawn(path.join(rootDir, 'node_modules', '.bin', 'expo'), ['export', '-p', 'web', '--output-dir', outDir, '--clear'], {
      cwd: rootDir,
      env: { ...process.env, ...WEB_BUILD_ENV },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let output = '';
    child.stdout.on('data', (d) => (output += d));
    child.stderr.on('data', (d) => (output += d));
    child.on('exit', (code) => (code === 0 ? resolve() : reject(new Error(`expo export failed (exit ${code}):\n${output.slice(-4000)}`))));
  });
  await finishWebBuild(outDir);
  writeFileSync(stampFile, hash);
  console.log(`[web] built in ${((Date.now() - started) / 1000).toFixed(1)} s`);
  return 'built';
}
