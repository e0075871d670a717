/**
 * `npm run --silent solve -- --roster FILE.json [--time-limit S] [--json] [--export-uai OUT.uai] [--export-lp OUT.lp] [--seed N]`
 *
 * Reads a roster JSON file (docs/roster-format.md), says why it cannot be feasible if a
 * pre-check finds a reason, else compiles and solves it and prints the roster (a table by
 * day, or JSON) with per-person hours, open seats and each rule's violations in words.
 * Exit codes: 0 solved with every hard rule kept; 1 no roster keeps every hard rule;
 * 2 bad arguments or a bad file (one line on stderr).
 */
import { readFile, writeFile } from 'node:fs/promises';
import { parseRoster, type Roster } from '../../shared/roster/schema';
import { formatDay, formatHours } from '../../shared/roster/derive';
import type { MapResult } from '../inference';
import { compileRoster, type CompiledRoster } from './compile';
import type { DecodedRoster } from './decode';
import { TERM_NAMES, type RosterScore } from './score-roster';
import { solveRoster } from './solve-roster';
import { expandCountingForUai } from './uai-expand';
import { writeUaiWithOffset } from '../io/uai';
import { rosterLp } from './lp-export';

type Args = { roster: string; timeLimitS: number; json: boolean; exportUai?: string; exportLp?: string; seed: number };

class UsageError extends Error {}

const USAGE = 'usage: solve --roster FILE.json [--time-limit S] [--json] [--export-uai OUT.uai] [--export-lp OUT.lp] [--seed N]';

function parseArgs(argv: string[]): Args {
  const out: Partial<Args> = { timeLimitS: 10, json: false, seed: 1 };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const value = () => {
      const v = argv[++i];
      if (v === undefined || v.startsWith('--')) throw new UsageError(`${a} needs a value; ${USAGE}`);
      return v;
    };
    if (a === '--roster') out.roster = value();
    else if (a === '--time-limit') {
      const s = Number(value());
      if (!Number.isFinite(s) || s <= 0 || s > 3600) throw new UsageError(`--time-limit must be seconds between 0 and 3600`);
      out.timeLimitS = s;
    } else if (a === '--json') out.json = true;
    else if (a === '--export-uai') out.exportUai = value();
    else if (a === '--export-lp') out.exportLp = value();
    else if (a === '--seed') {
      const s = Number(value());
      if (!Number.isInteger(s)) throw new UsageError('--seed must be an integer');
      out.seed = s;
    } else throw new UsageError(`unknown argument ${a}; ${USAGE}`);
  }
  if (!out.roster) throw new UsageError(`--roster is required; ${USAGE}`);
  return out as Args;
}

async function loadRoster(file: string): Promise<Roster> {
  let text: string;
  try {
    text = await readFile(file, 'utf8');
  } catch (e) {
    throw new UsageError(`${file}: cannot read (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})`);
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    throw new UsageError(`${file}: not JSON (${(e as Error).message})`);
  }
  const r = parseRoster(json);
  if (!r.ok) {
    const shown = r.issues.slice(0, 3).map((i) => `${i.path}: ${i.message}`).join('; ');
    throw new UsageError(`${file}: invalid roster: ${shown}${r.issues.length > 3 ? ` (and ${r.issues.length - 3} more)` : ''}`);
  }
  return r.roster;
}

/**
 * Write the compiled model as a UAI MARKOV file: counting factors become chains of partial
 * sums (uai-expand.ts) so every table stays small; the seats are the first variables.
 */
function exportUai(compiled: CompiledRoster, file: string): Promise<string> {
  const expanded = expandCountingForUai(compiled.model);
  const { text, offset } = writeUaiWithOffset(expanded.model);
  return writeFile(file, text, 'utf8').then(
    () =>
      `wrote ${file}: ${expanded.model.variables.length} variables (the first ${expanded.originalVariables} are the seats, in roster order), ${expanded.model.factors.length} factors; roster score = ln(UAI value) + ${offset}`,
  );
}

function pad(s: string, n: number): string {
  return s.length >= n ? s : s + ' '.repeat(n - s.length);
}

function table(roster: Roster, decoded: DecodedRoster): string {
  const labels = [...new Set(roster.shifts.map((s) => s.patternLabel))];
  const byDay = new Map<string, Map<string, string[]>>();
  for (const seat of decoded.seats) {
    if (!byDay.has(seat.date)) byDay.set(seat.date, new Map());
    const cell = byDay.get(seat.date)!;
    cell.set(seat.patternLabel, [...(cell.get(seat.patternLabel) ?? []), seat.personName ?? '(open)']);
  }
  const first = (n: string) => n.split(' ')[0];
  const rows = [...byDay.entries()].map(([date, cells]) => [formatDay(date), ...labels.map((l) => (cells.get(l) ?? []).map((n) => (n === '(open)' ? n : first(n))).join(', '))]);
  const head = ['day', ...labels];
  const widths = head.map((h, k) => Math.min(60, Math.max(h.length, ...rows.map((r) => r[k].length))));
  const line = (r: string[]) => r.map((c, k) => pad(c, widths[k])).join('  ').trimEnd();
  return [line(head), line(widths.map((w) => '-'.repeat(w))), ...rows.map(line)].join('\n');
}

function report(roster: Roster, decoded: DecodedRoster, result: MapResult, scored: RosterScore): string {
  const out: string[] = [];
  out.push(`${roster.name ?? 'roster'}: ${roster.period.start} to ${roster.period.end} (${roster.period.timeZone}), ${roster.people.length} people, ${roster.seats.length} seats`);
  out.push('');
  out.push(table(roster, decoded));
  out.push('');
  out.push('hours per person:');
  for (const p of decoded.people)
    out.push(
      `  ${pad(p.name, 26)} ${pad(formatHours(p.hours), 8)} ${p.contractedHours !== undefined ? pad(`of ${formatHours(Math.round(p.contractedHours * 10) / 10)}`, 11) : pad('', 11)} ${p.shifts} shifts, ${p.nights} nights, ${p.weekendShifts} weekend`,
    );
  out.push('');
  out.push(`open seats: ${decoded.openSeats.length}`);
  const terms = TERM_NAMES.filter((t) => scored.terms[t] !== 0 || scored.hardCounts[t] > 0);
  out.push('');
  out.push('score by term (points):');
  for (const t of terms) out.push(`  ${pad(t, 20)} ${scored.terms[t].toFixed(2)}${scored.hardCounts[t] ? `  (${scored.hardCounts[t]} hard violations)` : ''}`);
  const soft = scored.violations.filter((v) => !v.hard);
  const hard = scored.violations.filter((v) => v.hard);
  if (hard.length) {
    out.push('');
    out.push('hard rules broken:');
    for (const v of hard.slice(0, 30)) out.push(`  [${v.term}] ${v.message}`);
    if (hard.length > 30) out.push(`  … and ${hard.length - 30} more`);
  }
  if (soft.length) {
    out.push('');
    out.push('concessions (soft rules and wishes given up, by rule):');
    for (const t of TERM_NAMES) {
      const vs = soft.filter((v) => v.term === t);
      if (!vs.length) continue;
      out.push(`  ${t}: ${vs.length}, ${vs.reduce((m, v) => m + v.points, 0).toFixed(2)} points`);
      for (const v of vs.slice(0, 8)) out.push(`    ${v.points.toFixed(2)}  ${v.message}`);
      if (vs.length > 8) out.push(`    … and ${vs.length - 8} more`);
    }
  }
  out.push('');
  out.push(
    `score ${scored.total.toFixed(2)}, bound ${Number.isFinite(result.bound) ? result.bound.toFixed(2) : String(result.bound)}, gap ${(result.gap * 100).toFixed(2)} %${result.optimal ? ' (optimal)' : ''}; ${result.method}, ${result.iterations} iterations, ${(result.timeMs / 1000).toFixed(2)} s, stopped: ${result.stopReason}`,
  );
  return out.join('\n');
}

export async function main(argv: string[]): Promise<number> {
  let args: Args;
  let roster: Roster;
  try {
    args = parseArgs(argv);
    roster = await loadRoster(args.roster);
  } catch (e) {
    if (e instanceof UsageError) {
      process.stderr.write(`solve: ${e.message}\n`);
      return 2;
    }
    throw e;
  }
  if (args.exportUai) {
    try {
      // a note on stderr keeps --json output on stdout clean
      process.stderr.write(`solve: ${await exportUai(compileRoster(roster), args.exportUai)}\n`);
    } catch (e) {
      process.stderr.write(`solve: ${(e as Error).message}\n`);
      return 2;
    }
  }
  if (args.exportLp) {
    try {
      const lp = rosterLp(compileRoster(roster));
      await writeFile(args.exportLp, lp.text, 'utf8');
      process.stderr.write(`solve: wrote ${args.exportLp}: MIP with ${lp.columns} columns, ${lp.rows} rows; roster score = objective + ${lp.constant}\n`);
    } catch (e) {
      process.stderr.write(`solve: ${(e as Error).message}\n`);
      return 2;
    }
  }
  const solved = await solveRoster(roster, { timeLimitMs: args.timeLimitS * 1000, seed: args.seed });
  if (solved.status === 'infeasible') {
    const { reasons } = solved;
    if (args.json) process.stdout.write(JSON.stringify({ feasible: false, reasons }, null, 2) + '\n');
    else process.stdout.write(`no roster can keep every hard rule:\n${reasons.map((r) => `  - ${r}`).join('\n')}\n`);
    return 1;
  }
  const { result, decoded, score: scored } = solved;
  if (args.json) {
    process.stdout.write(
      JSON.stringify(
        {
          feasible: scored.feasible,
          score: scored.feasible ? scored.total : null,
          softScore: scored.softTotal,
          bound: Number.isFinite(result.bound) ? result.bound : null,
          gap: Number.isFinite(result.gap) ? result.gap : null,
          optimal: result.optimal,
          method: result.method,
          stopReason: result.stopReason,
          timeMs: result.timeMs,
          terms: scored.terms,
          hardCounts: scored.hardCounts,
          violations: scored.violations.map((v) => ({ ...v, points: v.hard ? null : v.points })),
          assignment: decoded.assignment,
          seats: decoded.seats,
          openSeats: decoded.openSeats.map((s) => s.seatId),
          people: decoded.people,
        },
        null,
        2,
      ) + '\n',
    );
  } else process.stdout.write(report(roster, decoded, result, scored) + '\n');
  return scored.feasible ? 0 : 1;
}
