/**
 * `npm run bench:bundle`: what the web app's JavaScript is made of. Exports the web app with
 * source maps into a temporary folder (the served build has none), reads them with
 * source-map-explorer and prints, for the scripts the first screen loads and for the whole
 * app: the size per package and the largest modules. docs/performance.md records the output.
 * `--web-dir DIR` reads an export made with `--source-maps` instead of building one.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { gzipSync } from 'node:zlib';
import { explore } from 'source-map-explorer';
import { WEB_BUILD_ENV } from '../bootstrap/web-build';
import { shellScripts } from '../bootstrap/web-finish';

const rootDir = path.resolve(import.meta.dirname, '..', '..');
const TOP = 15;

const argValue = (name: string) => {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 ? process.argv[i + 1] : undefined;
};

/** `node_modules/@scope/name/...` → `@scope/name`; the app's own files by their top folder. */
function packageOf(file: string): string {
  const inModules = file.match(/node_modules\/((?:@[^/]+\/)?[^/]+)/);
  if (inModules) return inModules[1];
  if (file.startsWith('[')) return file;
  return `${file.replace(/^\/+/, '').split('/')[0]}/ (ours)`;
}

async function sizes(dir: string, scripts: string[]): Promise<{ total: number; gzip: number; files: Map<string, number> }> {
  const files = new Map<string, number>();
  let total = 0;
  let gzip = 0;
  for (const rel of scripts) {
    const file = path.join(dir, rel);
    const result = await explore({ code: file, map: `${file}.map` }, { noBorderChecks: true, output: { format: 'json' } });
    for (const bundle of result.bundles) {
      total += bundle.totalBytes;
      for (const [name, data] of Object.entries(bundle.files)) files.set(name, (files.get(name) ?? 0) + data.size);
    }
    gzip += gzipSync(readFileSync(file)).length;
  }
  return { total, gzip, files };
}

const kib = (n: number) => `${(n / 1024).toFixed(1)} KiB`;

function print(title: string, s: { total: number; gzip: number; files: Map<string, number> }): void {
  console.log(`\n### ${title}: ${kib(s.total)} minified, ${kib(s.gzip)} gzipped\n`);
  const byPackage = new Map<string, number>();
  for (const [file, size] of s.files) byPackage.set(packageOf(file), (byPackage.get(packageOf(file)) ?? 0) + size);
  console.log('| package | minified |\n| --- | ---: |');
  for (const [name, size] of [...byPackage].sort((a, b) => b[1] - a[1]).slice(0, TOP)) console.log(`| ${name} | ${kib(size)} |`);
  console.log('\n| module | minified |\n| --- | ---: |');
  for (const [name, size] of [...s.files].sort((a, b) => b[1] - a[1]).slice(0, TOP)) console.log(`| ${name.replace(/^\/+/, '')} | ${kib(size)} |`);
}

async function main(): Promise<void> {
  const given = argValue('web-dir');
  const dir = given ?? mkdtempSync(path.join(os.tmpdir(), 'rotaloom-bundle-'));
  try {
    if (!given) {
      console.log('exporting the web app with source maps …');
      const out = spawnSync(path.join(rootDir, 'node_modules', '.bin', 'expo'), ['export', '-p', 'web', '--output-dir', dir, '--source-maps'], {
        cwd: rootDir,
        env: { ...process.env, ...WEB_BUILD_ENV },
        encoding: 'utf8',
      });
      if (out.status !== 0) throw new Error(`expo export failed:\n${(out.stdout + out.stderr).slice(-3000)}`);
    }
    const jsDir = path.join(dir, '_expo', 'static', 'js', 'web');
    const all = readdirSync(jsDir).filter((f) => f.endsWith('.js')).map((f) => path.join('_expo', 'static', 'js', 'web', f));
    print('Loaded by every first screen (the scripts in index.html)', await sizes(dir, shellScripts(dir)));
    print(`The whole app (${all.length} scripts)`, await sizes(dir, all));
  } finally {
    if (!given) rmSync(dir, { recursive: true, force: true });
  }
}

await main();
