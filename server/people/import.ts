import { Readable } from 'node:stream';
import { parse } from 'csv-parse';
import { unguardFormula } from '../exports/csv';
import type { RequestHandler } from 'express';
import multer from 'multer';
import { Person, Skill } from '../db/models';
import { nearestName } from './near-match';
import { HttpError } from '../http/errors';
import {
  createPersonBody,
  IMPORT_MAX_BYTES,
  IMPORT_MAX_ROWS,
  PEOPLE_CSV_COLUMNS,
  PEOPLE_CSV_REQUIRED,
  type ImportAction,
  type ImportReport,
  type ImportRow,
  type ImportRowError,
} from '../../shared/api/people';

/** How many row errors a report lists; the counts still cover every row. */
const MAX_LISTED_ERRORS = 500;

const fileError = (status: number, code: 'bad_request' | 'unprocessable' | 'payload_too_large', message: string, path = 'file') =>
  new HttpError(status, code, message, [{ path, message }]);

/**
 * multer with memory storage: one file in the field `file`, at most 5 MB. Its own errors become
 * readable 4xx answers (an oversized file is a 413 that says the limit).
 */
export function csvUpload(): RequestHandler {
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: IMPORT_MAX_BYTES, files: 1, fields: 10, fieldSize: 1024, parts: 12 } }).single('file');
  return (req, res, next) => {
    upload(req, res, (err: unknown) => {
      if (!err) return next();
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE') return next(fileError(413, 'payload_too_large', `The file is larger than ${IMPORT_MAX_BYTES / 1024 / 1024} MB. Split it into smaller files of at most ${IMPORT_MAX_ROWS.toLocaleString('en-GB')} people each.`));
        if (err.code === 'LIMIT_UNEXPECTED_FILE') return next(fileError(400, 'bad_request', `Send the CSV file in the form field "file" (got "${err.field ?? '?'}")`, `body.${err.field ?? 'file'}`));
        return next(fileError(400, 'bad_request', `The upload was not understood: ${err.message}`));
      }
      next(fileError(400, 'bad_request', 'The upload was not understood; send the CSV file as multipart/form-data in the field "file"'));
    });
  };
}

// ---- decoding ----

const startsWith = (buf: Buffer, bytes: number[]) => bytes.every((b, i) => buf[i] === b);

/**
 * The file as text, or a 4xx naming what it is instead: a spreadsheet, another binary file,
 * UTF-16 text, or bytes that are not UTF-8 (with the first line that has them).
 */
export function decodeCsvText(buf: Buffer): string {
  if (buf.length === 0) throw fileError(422, 'unprocessable', 'The file is empty. Choose a CSV file with a header row and one row per person.');
  if (startsWith(buf, [0x50, 0x4b, 0x03, 0x04])) throw fileError(422, 'unprocessable', 'This is a spreadsheet or other zipped file, not CSV. In your spreadsheet program choose "Save as" → "CSV UTF-8" and upload that file.');
  if (startsWith(buf, [0xd0, 0xcf, 0x11, 0xe0])) throw fileError(422, 'unprocessable', 'This is an old-style spreadsheet file (.xls), not CSV. Save it as "CSV UTF-8" and upload that file.');
  if (startsWith(buf, [0xff, 0xfe]) || startsWith(buf, [0xfe, 0xff])) throw fileError(422, 'unprocessable', 'This file is saved as UTF-16 ("Unicode text"). Save it as "CSV UTF-8" and upload that file.');
  if (buf.subarray(0, 8192).includes(0)) throw fileError(422, 'unprocessable', 'This is not a CSV file: it contains binary data. Choose a CSV file (text, one row per person).');
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(buf);
  } catch {
    // Find the first line with bytes that are not UTF-8, so the person knows where to look.
    let line = 1;
    let start = 0;
    const strict = new TextDecoder('utf-8', { fatal: true });
    for (let i = 0; i <= buf.length; i++) {
      if (i === buf.length || buf[i] === 0x0a) {
        try {
          strict.decode(buf.subarray(start, i));
        } catch {
          break;
        }
        line++;
        start = i + 1;
      }
    }
    throw fileError(422, 'unprocessable', `The file is not valid UTF-8 text (first on line ${line}); it was probably saved in an older encoding such as Windows-1252. Save it as "CSV UTF-8" and upload it again.`);
  }
}

/** The delimiter the header line uses: commas, or the semicolons and tabs some spreadsheet programs write. */
export function detectDelimiter(text: string): ',' | ';' | '\t' {
  const end = text.search(/\r?\n/);
  const header = end < 0 ? text : text.slice(0, end);
  const count = (ch: string) => header.split(ch).length - 1;
  const [best] = ([',', ';', '\t'] as const).map((d) => [d, count(d)] as const).sort((a, b) => b[1] - a[1]);
  return best[1] > 0 ? best[0] : ',';
}

const normaliseHeader = (h: string) => h.trim().toLowerCase().replace(/[\s-]+/g, '_');
const nameKey = (s: string) => s.trim().replace(/\s+/g, ' ').toLocaleLowerCase('en');

function parseHours(cell: string): number | null {
  const t = cell.trim();
  if (/^\d+([.,]\d+)?$/.test(t)) return Number(t.replace(',', '.'));
  return null;
}

interface ParsedRow {
  row: number;
  name: string;
  email: string | null | undefined;
  contractedHours: number | null;
  skillNames: string[] | undefined;
  skillIds: number[];
  errors: ImportRowError[];
}

interface Existing {
  id: number;
  name: string;
  email: string | null;
  contractedHours: number;
  skills: number[];
  version: number;
}

/**
 * Reads the CSV with csv-parse as a stream, checks the header, then checks each row against the
 * same schema the person form uses, the workspace's skills, the rest of the file and the people
 * already there. Nothing is written: the result says what a commit would do.
 */
export async function planImport(workspaceId: number, file: { buffer: Buffer; originalname?: string }, existing: Existing[], skills: Array<{ id: number; name: string }>): Promise<{ report: ImportReport; rows: ParsedRow[] }> {
  const text = decodeCsvText(file.buffer);
  if (text.replace(/^\uFEFF/, '').trim() === '') throw fileError(422, 'unprocessable', 'The file is empty. Choose a CSV file with a header row and one row per person.');
  const delimiter = detectDelimiter(text.replace(/^\uFEFF/, ''));

  const parser = parse({ bom: true, delimiter, relax_column_count: true, skip_empty_lines: true, relax_quotes: false });
  // Feed the text in pieces; the parser streams records back and we stop as soon as the file is over the row limit.
  const CHUNK = 64 * 1024;
  const source = Readable.from((function* () {
    for (let i = 0; i < text.length; i += CHUNK) yield text.slice(i, i + CHUNK);
  })());
  source.pipe(parser);

  let header: string[] | null = null;
  let columnIndex: Partial<Record<(typeof PEOPLE_CSV_COLUMNS)[number], number>> = {};
  const rows: ParsedRow[] = [];
  const skillByKey = new Map(skills.map((s) => [nameKey(s.name), s]));
  const seenNames = new Map<string, number>();
  const seenEmails = new Map<string, number>();
  let record = 0;
  try {
    for await (const cells of parser as AsyncIterable<string[]>) {
      record++;
      if (!header) {
        header = cells.map(normaliseHeader);
        columnIndex = checkHeader(header, cells);
        continue;
      }
      if (cells.every((c) => c.trim() === '')) continue;
      if (rows.length >= IMPORT_MAX_ROWS) {
        source.destroy();
        parser.destroy();
        throw fileError(422, 'unprocessable', `The file has more than ${IMPORT_MAX_ROWS.toLocaleString('en-GB')} people rows; nothing was imported. Split it into files of at most ${IMPORT_MAX_ROWS.toLocaleString('en-GB')} rows.`);
      }
      rows.push(checkRow(record, cells, header.length, columnIndex, skillByKey, seenNames, seenEmails));
    }
  } catch (err) {
    if (err instanceof HttpError) throw err;
    const e = err as { code?: string; lines?: number; message?: string };
    if (typeof e.code === 'string' && e.code.startsWith('CSV_')) {
      throw fileError(422, 'unprocessable', `The file is not valid CSV near line ${e.lines ?? '?'}: ${plainCsvError(e.code, e.message)}. Nothing was imported.`);
    }
    throw err;
  }
  if (!header) throw fileError(422, 'unprocessable', 'The file is empty. Choose a CSV file with a header row and one row per person.');
  if (rows.length === 0) throw fileError(422, 'unprocessable', 'The file has a header row but no people. Add one row per person below the header.');

  const report = compare(file.originalname ?? 'people.csv', delimiter, header, rows, existing, skills);
  return { report, rows };
}

function plainCsvError(code: string, message?: string): string {
  switch (code) {
    case 'CSV_QUOTE_NOT_CLOSED':
      return 'a quoted cell is never closed (a " without its partner)';
    case 'CSV_INVALID_CLOSING_QUOTE':
    case 'CSV_NON_TRIMABLE_CHAR_AFTER_CLOSING_QUOTE':
      return 'a quote " inside a cell must be doubled ("") and the cell quoted';
    default:
      return message?.replace(/^Invalid Record Length: /, '') ?? code;
  }
}

function checkHeader(header: string[], raw: string[]) {
  const known = new Set<string>(PEOPLE_CSV_COLUMNS);
  const list = PEOPLE_CSV_COLUMNS.join(', ');
  const unknown = header.map((h, i) => [h, raw[i]] as const).filter(([h]) => !known.has(h));
  if (unknown.length > 0) {
    const shown = unknown.map(([, r]) => `"${r.trim()}"`).join(', ');
    throw fileError(422, 'unprocessable', `Unknown column${unknown.length > 1 ? 's' : ''} ${shown} in the header row. The columns are ${list} (name and contracted_hours are required).`, 'file.header');
  }
  const missing = PEOPLE_CSV_REQUIRED.filter((c) => !header.includes(c));
  if (missing.length > 0) {
    throw fileError(422, 'unprocessable', `Missing column${missing.length > 1 ? 's' : ''} ${missing.map((m) => `"${m}"`).join(', ')} in the header row. The columns are ${list}; the first row must name them.`, 'file.header');
  }
  const twice = header.find((h, i) => header.indexOf(h) !== i);
  if (twice) throw fileError(422, 'unprocessable', `The column "${twice}" appears twice in the header row.`, 'file.header');
  return Object.fromEntries(header.map((h, i) => [h, i])) as Partial<Record<(typeof PEOPLE_CSV_COLUMNS)[number], number>>;
}

function checkRow(
  row: number,
  cells: string[],
  width: number,
  col: Partial<Record<(typeof PEOPLE_CSV_COLUMNS)[number], number>>,
  skillByKey: Map<string, { id: number; name: string }>,
  seenNames: Map<string, number>,
  seenEmails: Map<string, number>,
): ParsedRow {
  const errors: ImportRowError[] = [];
  const add = (message: string, column?: string) => errors.push({ row, column, message: `row ${row}: ${message}` });
  const cell = (c: keyof typeof col) => (col[c] === undefined ? undefined : unguardFormula((cells[col[c]!] ?? '').trim()));
  if (cells.length > width) add(`has ${cells.length} cells but the header has ${width} columns (is a comma inside a cell without quotes?)`);

  const name = (cell('name') ?? '').replace(/\s+/g, ' ');
  const emailCell = cell('email');
  const email = emailCell === undefined ? undefined : emailCell === '' ? null : emailCell;
  const hoursCell = cell('contracted_hours') ?? '';
  const contractedHours = parseHours(hoursCell);
  if (hoursCell === '') add('contracted_hours is empty; give the hours per week (0 for none)', 'contracted_hours');
  else if (contractedHours === null) add(`contracted_hours "${hoursCell}" is not a number of hours`, 'contracted_hours');

  const skillCell = cell('skills');
  const skillNames = skillCell === undefined ? undefined : [...new Set(skillCell.split(';').map((s) => s.trim().replace(/\s+/g, ' ')).filter(Boolean))];
  const skillIds: number[] = [];
  for (const s of skillNames ?? []) {
    const found = skillByKey.get(nameKey(s));
    if (found) {
      skillIds.push(found.id);
      continue;
    }
    const near = nearestName(nameKey(s), skillByKey, skillByKey);
    const hint = near ? ` (did you mean '${near.name}'?)` : '';
    add(`unknown skill '${s}'${hint}`, 'skills');
  }

  // The same checks as the person form (shared/api/people.ts).
  const checked = createPersonBody.safeParse({ name, email: email ?? null, contractedHours: contractedHours ?? 0, skillIds });
  if (!checked.success) {
    const label: Record<string, string> = { name: 'name', email: 'email', contractedHours: 'contracted_hours' };
    for (const issue of checked.error.issues) {
      const field = String(issue.path[0]);
      if (field === 'contractedHours' && contractedHours === null) continue;
      add(`${label[field] ?? field}: ${field === 'name' && name === '' ? 'the name is empty' : issue.message}`, label[field]);
    }
  }

  if (name) {
    const first = seenNames.get(nameKey(name));
    if (first !== undefined) add(`'${name}' is also on row ${first}; each person may appear once per file`, 'name');
    else seenNames.set(nameKey(name), row);
  }
  if (email) {
    const first = seenEmails.get(email.toLowerCase());
    if (first !== undefined) add(`e-mail ${email} is also on row ${first}`, 'email');
    else seenEmails.set(email.toLowerCase(), row);
  }
  return { row, name, email, contractedHours, skillNames, skillIds, errors };
}

const sameSet = (a: number[], b: number[]) => a.length === b.length && [...a].sort().join() === [...b].sort().join();

function compare(fileName: string, delimiter: ImportReport['delimiter'], header: string[], rows: ParsedRow[], existing: Existing[], skills: Array<{ id: number; name: string }>): ImportReport {
  const byName = new Map<string, Existing[]>();
  for (const p of existing) byName.set(nameKey(p.name), [...(byName.get(nameKey(p.name)) ?? []), p]);
  const skillName = new Map(skills.map((s) => [s.id, s.name]));
  const counts: Record<ImportAction, number> = { create: 0, update: 0, unchanged: 0, error: 0 };
  const errors: ImportRowError[] = [];
  const items: ImportRow[] = rows.map((r) => {
    const matches = byName.get(nameKey(r.name)) ?? [];
    if (r.name && matches.length > 1) r.errors.push({ row: r.row, column: 'name', message: `row ${r.row}: ${matches.length} people here are already called '${r.name}'; give them distinct names before importing` });
    const base = { row: r.row, name: r.name, email: r.email ?? null, contractedHours: r.contractedHours, skills: r.skillNames ?? [] };
    if (r.errors.length > 0) {
      counts.error++;
      errors.push(...r.errors);
      return { ...base, action: 'error' as const };
    }
    const match = matches[0];
    if (!match) {
      counts.create++;
      return { ...base, action: 'create' as const };
    }
    const changes: string[] = [];
    if (match.name !== r.name) changes.push(`name "${match.name}" → "${r.name}"`);
    if (r.email !== undefined && (match.email ?? null) !== r.email) changes.push(`e-mail ${match.email ?? '(none)'} → ${r.email ?? '(none)'}`);
    if (r.contractedHours !== null && match.contractedHours !== r.contractedHours) changes.push(`hours ${match.contractedHours} → ${r.contractedHours}`);
    if (r.skillNames !== undefined && !sameSet(match.skills.filter((id) => skillName.has(id)), r.skillIds)) {
      const names = (ids: number[]) => ids.map((id) => skillName.get(id)).filter(Boolean).join('; ') || '(none)';
      changes.push(`skills ${names(match.skills)} → ${names(r.skillIds)}`);
    }
    const action = changes.length > 0 ? 'update' : 'unchanged';
    counts[action]++;
    return { ...base, action, personId: match.id, changes };
  });
  return {
    fileName,
    delimiter,
    columns: header,
    rows: rows.length,
    counts,
    errors: errors.slice(0, MAX_LISTED_ERRORS),
    items,
    canCommit: counts.error === 0,
  };
}

async function loadWorkspace(workspaceId: number, transaction?: import('sequelize').Transaction) {
  const [people, skills] = await Promise.all([
    Person.findAll({ where: { workspaceId }, transaction, lock: transaction ? transaction.LOCK.UPDATE : undefined }),
    Skill.findAll({ where: { workspaceId }, transaction }),
  ]);
  return {
    existing: people.map((p) => ({ id: p.id, name: p.name, email: p.email ?? null, contractedHours: p.contractedHours, skills: p.skills ?? [], version: p.version })),
    skills: skills.map((s) => ({ id: s.id, name: s.name })),
  };
}

function requireFile(file: Express.Multer.File | undefined): Express.Multer.File {
  if (!file) throw fileError(400, 'bad_request', 'Choose a CSV file to import (send it as multipart/form-data in the field "file").');
  return file;
}

/** The dry run: what the file would create and update, and every row error. */
export async function previewImport(workspaceId: number, file: Express.Multer.File | undefined): Promise<ImportReport> {
  const f = requireFile(file);
  const { existing, skills } = await loadWorkspace(workspaceId);
  return (await planImport(workspaceId, f, existing, skills)).report;
}

/**
 * All or nothing: the file is checked again inside one transaction (people locked), and any row
 * error rolls everything back. A concurrent edit of a matched person makes the commit a 409.
 */
export async function commitImport(workspaceId: number, file: Express.Multer.File | undefined): Promise<ImportReport> {
  const f = requireFile(file);
  const sequelize = Person.sequelize!;
  return sequelize.transaction(async (transaction) => {
    const { existing, skills } = await loadWorkspace(workspaceId, transaction);
    const { report, rows } = await planImport(workspaceId, f, existing, skills);
    if (!report.canCommit) {
      throw Object.assign(new HttpError(422, 'unprocessable', `${report.counts.error} row${report.counts.error === 1 ? ' has' : 's have'} errors; nothing was imported. Fix them and upload the file again.`, report.errors.slice(0, 20).map((e) => ({ path: `file.row.${e.row}`, message: e.message }))), { report });
    }
    const byRow = new Map(rows.map((r) => [r.row, r]));
    const versions = new Map(existing.map((p) => [p.id, p.version]));
    const creates = report.items.filter((i) => i.action === 'create').map((i) => {
      const r = byRow.get(i.row)!;
      return { workspaceId, name: r.name, email: r.email ?? null, contractedHours: r.contractedHours ?? 0, skills: r.skillIds };
    });
    if (creates.length > 0) await Person.bulkCreate(creates, { transaction });
    for (const item of report.items.filter((i) => i.action === 'update')) {
      const r = byRow.get(item.row)!;
      const version = versions.get(item.personId!)!;
      const changes: Record<string, unknown> = { name: r.name, contractedHours: r.contractedHours, version: version + 1 };
      if (r.email !== undefined) changes.email = r.email;
      if (r.skillNames !== undefined) changes.skills = r.skillIds;
      const [count] = await Person.update(changes, { where: { id: item.personId!, workspaceId, version }, transaction });
      if (count !== 1) throw new HttpError(409, 'conflict', `Someone changed ${r.name} while the import ran; nothing was imported. Upload the file again.`, [{ path: `file.row.${item.row}`, message: 'changed meanwhile' }]);
    }
    return { ...report, committed: true };
  });
}
