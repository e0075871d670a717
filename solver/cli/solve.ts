/**
 * Command line: solve a UAI MARKOV model for its MAP (MPE) assignment.
 *
 *   npm run --silent solve -- MODEL.uai [--time-limit SECONDS] [--seed N] [--json]
 *   npm run --silent solve -- --roster …   (delegated to solver/roster/cli)
 *
 * Prints the UAI MPE result ("MPE" / "N v1 … vN"), or with --json one object with
 * assignment, score, bound, gap, iterations and time. A missing or malformed file
 * or a zero-probability model prints one line naming the line at fault, exit 2.
 */
import { readFileSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import { parseUai, UaiError, writeMpe } from '../io/uai';
import { solveMap } from '../inference/solve';
import { MAP_PRESETS } from '../inference/options';
import { violatedFactors } from '../model/score';

export class CliError extends Error {}

interface Args {
  file: string;
  timeLimitMs: number;
  seed: number;
  json: boolean;
}

function parseArgs(argv: string[]): Args {
  let file: string | undefined;
  let timeLimitMs: number = MAP_PRESETS.commandLine.timeLimitMs, seed: number = MAP_PRESETS.commandLine.seed, json = false;
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!;
    const value = (): string => {
      const v = argv[++i];
      if (v === undefined) throw new CliError(`${a} needs a value`);
      return v;
    };
    if (a === '--json') json = true;
    else if (a === '--time-limit') {
      const v = Number(value());
      if (!Number.isFinite(v) || v <= 0) throw new CliError(`--time-limit must be a positive number of seconds`);
      timeLimitMs = v * 1000;
    } else if (a === '--seed') {
      const v = Number(value());
      if (!Number.isInteger(v)) throw new CliError(`--seed must be an integer`);
      seed = v;
    } else if (a.startsWith('--')) throw new CliError(`unknown option ${a}`);
    else if (file === undefined) file = a;
    else throw new CliError(`unexpected argument ${a}`);
  }
  if (file === undefined) throw new CliError('usage: solve MODEL.uai [--time-limit SECONDS] [--seed N] [--json]');
  return { file, timeLimitMs, seed, json };
}

const finiteOrNull = (v: number): number | null => (Number.isFinite(v) ? v : null);

/** Runs the CLI; returns the exit code. Output goes through the given writers. */
export async function main(argv: string[], out: (s: string) => void = (s) => process.stdout.write(s), err: (s: string) => void = (s) => process.stderr.write(s)): Promise<number> {
  if (argv.includes('--roster')) {
    const mod = (await import('../roster/cli')) as { main: (argv: string[]) => Promise<number> };
    return mod.main(argv);
  }
  let args: Args;
  try {
    args = parseArgs(argv);
  } catch (e) {
    err(`error: ${(e as Error).message}\n`);
    return 2;
  }
  let text: string;
  try {
    text = readFileSync(args.file, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    err(`error: ${args.file}: cannot read the file (${code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'is a directory' : (e as Error).message})\n`);
    return 2;
  }
  let parsed: ReturnType<typeof parseUai>;
  try {
    parsed = parseUai(text);
  } catch (e) {
    if (e instanceof UaiError) err(`error: ${args.file} ${e.message}\n`);
    else err(`error: ${args.file}: ${(e as Error).message.split('\n')[0]}\n`);
    return 2;
  }
  const { model, factorLines, valueLines } = parsed;
  // a table of zeros makes every assignment impossible
  for (let f = 0; f < model.factors.length; f++) {
    const fac = model.factors[f]!;
    const t = fac.kind === 'table' ? Array.from(fac.table) : [];
    if (t.length > 0 && t.every((v) => v === -Infinity)) {
      err(`error: ${args.file} line ${valueLines[f]}: zero-probability model: every entry of factor ${f}'s table is 0\n`);
      return 2;
    }
  }
  const r = await solveMap(model, { timeLimitMs: args.timeLimitMs, seed: args.seed });
  if (!r.feasible) {
    const v = violatedFactors(model, r.assignment);
    const f = v[0] ?? 0;
    const proof = r.optimal ? 'no assignment has non-zero probability' : 'no assignment with non-zero probability was found in the time limit';
    err(`error: ${args.file} line ${factorLines[f] ?? 1}: zero-probability model: ${proof} (factor ${f} is violated by the best assignment)\n`);
    return 2;
  }
  if (args.json)
    out(
      JSON.stringify({
        assignment: r.assignment,
        score: r.score,
        bound: finiteOrNull(r.bound),
        gap: finiteOrNull(r.gap),
        optimal: r.optimal,
        method: r.method,
        iterations: r.iterations,
        timeMs: r.timeMs,
        timeToBestMs: r.timeToBestMs,
        stopReason: r.stopReason,
      }) + '\n',
    );
  else out(writeMpe(r.assignment));
  return 0;
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  main(process.argv.slice(2)).then(
    (code) => {
      process.exitCode = code;
    },
    (e: unknown) => {
      process.stderr.write(`error: ${(e as Error).message.split('\n')[0]}\n`);
      process.exitCode = 2;
    },
  );
}
