/**
 * UAI interchange (the graphical-models competition formats):
 * - MARKOV model files: preamble (type, N, cardinalities, F, scopes) then one
 *   table per factor (entry count, then values; the LAST scope variable varies
 *   fastest). Values are factor values (probability-like, ≥ 0); points = ln(value),
 *   so 0 is an impossible combination (-Infinity).
 * - MPE result files: "MPE" then "N v1 … vN".
 * Pure text in, text out; errors are UaiError with the 1-based line at fault.
 */
import type { Factor, Model } from '../model/types';
import { factorScore, scopeOf, validateModel } from '../model/factor-graph';

export class UaiError extends Error {
  constructor(public line: number, message: string) {
    super(`line ${line}: ${message}`);
    this.name = 'UaiError';
  }
}

interface Tok {
  text: string;
  line: number;
}

function tokenize(text: string): Tok[] {
  const out: Tok[] = [];
  const lines = text.split(/\r?\n/);
  lines.forEach((l, i) => {
    const hash = l.indexOf('#'); // comments are not in the format, but tolerate trailing ones
    const body = hash >= 0 ? l.slice(0, hash) : l;
    for (const t of body.split(/\s+/)) if (t) out.push({ text: t, line: i + 1 });
  });
  return out;
}

class Reader {
  private i = 0;
  constructor(private toks: Tok[], private lastLine: number) {}
  get line(): number {
    return this.i < this.toks.length ? this.toks[this.i]!.line : this.lastLine;
  }
  next(what: string): Tok {
    const t = this.toks[this.i];
    if (!t) throw new UaiError(this.lastLine, `unexpected end of file, expected ${what}`);
    this.i++;
    return t;
  }
  int(what: string, min = 0): number {
    const t = this.next(what);
    if (!/^[+-]?\d+$/.test(t.text)) throw new UaiError(t.line, `expected ${what} (an integer), found "${t.text}"`);
    const v = Number(t.text);
    if (v < min) throw new UaiError(t.line, `${what} must be at least ${min}, found ${v}`);
    return v;
  }
  num(what: string): { v: number; line: number } {
    const t = this.next(what);
    const v = Number(t.text);
    if (t.text === '' || !Number.isFinite(v)) throw new UaiError(t.line, `expected ${what} (a number), found "${t.text}"`);
    return { v, line: t.line };
  }
  done(): boolean {
    return this.i >= this.toks.length;
  }
  peekLine(): number {
    return this.line;
  }
}

/** Where each parsed factor's table starts (for error messages about the model). */
export interface UaiParseResult {
  model: Model;
  /** Line of each factor's table (entry count line). */
  factorLines: number[];
  /** Line of each factor's scope in the preamble. */
  scopeLines: number[];
  /** Line of the first value of each factor's table. */
  valueLines: number[];
}

/** Parse a UAI MARKOV file. Each factor becomes a 'table' factor with points = ln(value). */
export function parseUai(text: string): UaiParseResult {
  const lines = text.split(/\r?\n/);
  let lastLine = lines.length;
  while (lastLine > 1 && lines[lastLine - 1]!.trim() === '') lastLine--;
  const r = new Reader(tokenize(text), lastLine);
  const head = r.next('the model type MARKOV');
  if (head.text.toUpperCase() !== 'MARKOV') {
    if (head.text.toUpperCase() === 'BAYES') throw new UaiError(head.line, 'BAYES networks are not supported; expected MARKOV');
    throw new UaiError(head.line, `expected MARKOV, found "${head.text}"`);
  }
  const n = r.int('the number of variables');
  const variables: Model['variables'] = [];
  for (let i = 0; i < n; i++) variables.push({ name: `x${i}`, cardinality: r.int(`the cardinality of variable ${i}`, 1) });
  const F = r.int('the number of factors');
  const scopes: number[][] = [];
  const scopeLines: number[] = [];
  for (let f = 0; f < F; f++) {
    const line = r.peekLine();
    const k = r.int(`the scope size of factor ${f}`);
    const sc: number[] = [];
    for (let j = 0; j < k; j++) {
      const ln = r.peekLine();
      const v = r.int(`variable ${j} of factor ${f}'s scope`);
      if (v >= n) throw new UaiError(ln, `factor ${f} uses variable ${v}, but there are only ${n} variables`);
      if (sc.includes(v)) throw new UaiError(ln, `factor ${f} lists variable ${v} twice`);
      sc.push(v);
    }
    scopes.push(sc);
    scopeLines.push(line);
  }
  const factors: Factor[] = [];
  const factorLines: number[] = [];
  const valueLines: number[] = [];
  for (let f = 0; f < F; f++) {
    const line = r.peekLine();
    const expected = scopes[f]!.reduce((a, v) => a * variables[v]!.cardinality, 1);
    const count = r.int(`the table size of factor ${f}`);
    if (count !== expected) throw new UaiError(line, `factor ${f} has a table of ${count} entries, but its scope needs ${expected}`);
    const table = new Array<number>(count);
    valueLines.push(count > 0 ? r.peekLine() : line);
    for (let e = 0; e < count; e++) {
      const { v, line: ln } = r.num(`entry ${e} of factor ${f}'s table`);
      if (v < 0) throw new UaiError(ln, `factor ${f} has a negative value ${v}`);
      table[e] = Math.log(v);
    }
    factors.push({ kind: 'table', vars: scopes[f]!, table, id: `f${f}`, label: `factor ${f} (line ${line})` });
    factorLines.push(line);
  }
  if (!r.done()) throw new UaiError(r.line, `unexpected extra content after ${F} factor tables`);
  const model: Model = { variables, factors };
  validateModel(model);
  return { model, factorLines, scopeLines, valueLines };
}

/** Size above which a factor is not expanded into a UAI table. */
export const UAI_MAX_TABLE = 1_000_000;

/** Dense table (last variable fastest) of one factor's points, over its scope (n-ary allDifferent excluded). */
function denseTable(model: Model, f: Factor, scope: number[]): number[] {
  const cards = scope.map((v) => model.variables[v]!.cardinality);
  const size = cards.reduce((a, b) => a * b, 1);
  if (size > UAI_MAX_TABLE) throw new Error(`factor ${f.id ?? f.kind} needs a table of ${size} entries (limit ${UAI_MAX_TABLE})`);
  const x = new Array<number>(model.variables.length).fill(0);
  const idx = new Array<number>(scope.length).fill(0);
  const out: number[] = [];
  for (let e = 0; e < size; e++) {
    scope.forEach((v, j) => (x[v] = idx[j]!));
    out.push(factorScore(model, f, x));
    for (let j = scope.length - 1; j >= 0; j--) {
      if (++idx[j]! < cards[j]!) break;
      idx[j] = 0;
    }
  }
  return out;
}

export interface UaiWriteResult {
  text: string;
  /** Points subtracted while normalizing tables: model score = ln(UAI product) + offset. */
  offset: number;
}

/**
 * Write a model as a UAI MARKOV file. Structured factors are expanded into dense
 * tables (n-ary allDifferent into one pairwise table per pair); each table is
 * scaled so its largest value is 1, and the points removed are returned as offset.
 */
export function writeUaiWithOffset(model: Model): UaiWriteResult {
  validateModel(model);
  const scopes: number[][] = [];
  const tables: number[][] = [];
  for (const f of model.factors) {
    if (f.kind === 'allDifferent' && f.vars.length > 2) {
      for (let a = 0; a < f.vars.length; a++)
        for (let b = a + 1; b < f.vars.length; b++) {
          const pair: Factor = { kind: 'allDifferent', vars: [f.vars[a]!, f.vars[b]!], penalty: f.penalty };
          scopes.push(pair.vars);
          tables.push(denseTable(model, pair, pair.vars));
        }
      continue;
    }
    const sc = scopeOf(f);
    scopes.push(sc);
    tables.push(denseTable(model, f, sc));
  }
  let offset = model.constant ?? 0;
  const lines: string[] = ['MARKOV', String(model.variables.length), model.variables.map((v) => v.cardinality).join(' '), String(scopes.length)];
  for (const sc of scopes) lines.push([sc.length, ...sc].join(' '));
  lines.push('');
  tables.forEach((t) => {
    let m = -Infinity;
    for (const v of t) if (v > m) m = v;
    if (m === -Infinity) m = 0; // an all-zero table stays all zero
    offset += m;
    lines.push(String(t.length));
    lines.push(t.map((v) => (v === -Infinity ? '0' : String(Math.exp(v - m)))).join(' '));
    lines.push('');
  });
  return { text: lines.join('\n'), offset };
}

/** UAI MARKOV text of a model (see writeUaiWithOffset for the score offset). */
export function writeUai(model: Model): string {
  return writeUaiWithOffset(model).text;
}

/** MPE result text: "MPE" then "N v1 … vN". */
export function writeMpe(assignment: ArrayLike<number>): string {
  return `MPE\n${[assignment.length, ...Array.from(assignment)].join(' ')}\n`;
}

/** Parse an MPE result (also accepts the older form with a sample count line "1" after MPE). */
export function parseMpe(text: string, n?: number): number[] {
  const toks = tokenize(text);
  const r = new Reader(toks, text.split(/\r?\n/).length);
  const head = r.next('MPE');
  if (head.text !== 'MPE') throw new UaiError(head.line, `expected MPE, found "${head.text}"`);
  let count = r.int('the number of variables');
  // older layout: a sample count (1) first, then N and the values
  if (count === 1 && toks.length >= 4 && toks.length - 3 === Number(toks[2]!.text)) count = r.int('the number of variables');
  if (n !== undefined && count !== n) throw new UaiError(head.line + 1, `expected ${n} values, the result lists ${count}`);
  const out: number[] = [];
  for (let i = 0; i < count; i++) out.push(r.int(`value ${i}`));
  return out;
}
