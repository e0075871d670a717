import { parse } from 'csv-parse/sync';
import { Op } from 'sequelize';
import { Person } from '../db/models';
import { HttpError } from '../http/errors';
import { localDateSchema, localTimeSchema } from '../../shared/roster/schema';
import {
  ABSENCE_CSV_COLUMNS,
  ABSENCE_CSV_REQUIRED,
  ABSENCE_KINDS,
  ABSENCE_KIND_WORDS,
  type AbsenceImportReport,
  type AbsenceImportRow,
  type AbsenceKindName,
} from '../../shared/api/absences';
import { AbsenceRow } from './models';
import { absenceSpan, spansOverlap } from './span';
import { describeAbsence, lockPeople } from './repository';

/** One file's rows at most: a year of absences for a large workspace fits well within it. */
const MAX_ROWS = 5000;

const csvError = (message: string) => new HttpError(422, 'unprocessable', message, [{ path: 'body.csv', message }]);
const norm = (s: string) => s.trim().replace(/\s+/g, ' ').toLocaleLowerCase('en');
const normHeader = (h: string) => h.trim().toLowerCase().replace(/[\s-]+/g, '_');

/** "annual", "Annual leave", "SICK" … → the kind; the form's words are accepted as well as the keys. */
function kindOf(cell: string): AbsenceKindName | null {
  const k = norm(cell);
  return ABSENCE_KINDS.find((kind) => kind === k || norm(ABSENCE_KIND_WORDS[kind]) === k) ?? null;
}

interface Candidate {
  report: AbsenceImportRow;
  value: {
    personId: number;
    kind: AbsenceKindName;
    startDate: string;
    endDate: string;
    startTime: string | null;
    endTime: string | null;
    creditHours: number | null;
    note: string | null;
  } | null;
}

/**
 * Parses the CSV (RFC 4180: quoted fields may hold commas, doubled quotes and line breaks) and
 * checks every row: the person by name or e-mail in this workspace, the kind, the dates, and
 * overlaps with stored absences and with other rows of the same file.
 */
async function readRows(workspaceId: number, csv: string): Promise<Candidate[]> {
  let records: string[][];
  try {
    records = parse(csv, { bom: true, relax_column_count: true, skip_empty_lines: true, trim: false });
  } catch (err) {
    // csv-parse names the line ("Quote Not Closed: the parsing is finished with an opening quote at line 3").
    throw csvError(`The file is not valid CSV: ${err instanceof Error ? err.message : String(err)}`);
  }
  if (records.length === 0) throw csvError('The file is empty. It needs a header row and one row per absence.');
  const header = records[0].map(normHeader);
  const unknown = header.filter((h) => h !== '' && !(ABSENCE_CSV_COLUMNS as readonly string[]).includes(h));
  if (unknown.length) throw csvError(`Unknown column${unknown.length > 1 ? 's' : ''} ${unknown.map((u) => `"${u}"`).join(', ')}; the columns are ${ABSENCE_CSV_COLUMNS.join(', ')}.`);
  const missing = ABSENCE_CSV_REQUIRED.filter((c) => !header.includes(c));
  if (missing.length) throw csvError(`The header row lacks ${missing.join(', ')}; the columns are ${ABSENCE_CSV_COLUMNS.join(', ')}.`);
  if (records.length - 1 > MAX_ROWS) throw csvError(`The file has ${records.length - 1} rows; at most ${MAX_ROWS} absences per file.`);
  const col = (rec: string[], c: (typeof ABSENCE_CSV_COLUMNS)[number]) => {
    const i = header.indexOf(c);
    return i < 0 ? '' : (rec[i] ?? '').trim();
  };

  const people = await Person.findAll({ where: { workspaceId }, attributes: ['id', 'name', 'email'] });
  const byName = new Map<string, Person[]>();
  for (const p of people) byName.set(norm(p.name), [...(byName.get(norm(p.name)) ?? []), p]);
  const byEmail = new Map(people.filter((p) => p.email).map((p) => [norm(p.email!), p]));

  const out: Candidate[] = [];
  records.slice(1).forEach((rec, i) => {
    const errors: AbsenceImportRow['errors'] = [];
    const who = col(rec, 'person');
    let person: Person | undefined;
    if (!who) errors.push({ column: 'person', message: 'required' });
    else {
      const named = byName.get(norm(who)) ?? [];
      person = byEmail.get(norm(who)) ?? (named.length === 1 ? named[0] : undefined);
      if (!person) errors.push({ column: 'person', message: named.length > 1 ? `${named.length} people are called "${who}"; use their e-mail address` : `no person "${who}" in this workspace` });
    }
    const kindCell = col(rec, 'kind');
    const kind = kindOf(kindCell);
    if (!kind) errors.push({ column: 'kind', message: kindCell ? `unknown kind "${kindCell}"; use ${ABSENCE_KINDS.join(', ')}` : 'required' });
    const date = (c: 'start_date' | 'end_date') => {
      const v = col(rec, c);
      if (!v) return void errors.push({ column: c, message: 'required' });
      const r = localDateSchema.safeParse(v);
      if (!r.success) return void errors.push({ column: c, message: `"${v}": ${r.error.issues[0].message}` });
      return v;
    };
    const time = (c: 'start_time' | 'end_time') => {
      const v = col(rec, c);
      if (!v) return null;
      if (!localTimeSchema.safeParse(v).success) errors.push({ column: c, message: `"${v}": expected a time HH:mm` });
      return v;
    };
    const startDate = date('start_date');
    const endDate = date('end_date');
    const startTime = time('start_time');
    const endTime = time('end_time');
    if (startDate && endDate && `${endDate}T${endTime ?? '24:00'}` <= `${startDate}T${startTime ?? '00:00'}`) errors.push({ column: 'end_date', message: 'the absence ends before it starts' });
    const creditCell = col(rec, 'credit_hours');
    let creditHours: number | null = null;
    if (creditCell) {
      const n = /^\d+([.,]\d+)?$/.test(creditCell) ? Number(creditCell.replace(',', '.')) : NaN;
      if (!Number.isFinite(n) || n > 5000) errors.push({ column: 'credit_hours', message: `"${creditCell}": expected hours from 0 to 5000` });
      else creditHours = n;
    }
    const note = col(rec, 'note');
    if (note.length > 500) errors.push({ column: 'note', message: 'at most 500 characters' });
    const report: AbsenceImportRow = { row: i + 2, personName: person?.name ?? who, personId: person?.id ?? null, kind: kind ?? kindCell, startDate: startDate ?? col(rec, 'start_date'), endDate: endDate ?? col(rec, 'end_date'), errors };
    out.push({
      report,
      value: errors.length === 0 ? { personId: person!.id, kind: kind!, startDate: startDate!, endDate: endDate!, startTime, endTime, creditHours, note: note || null } : null,
    });
  });
  return out;
}

/** Overlaps with stored (requested or approved) absences and between rows of the file, as row errors. */
async function checkOverlaps(workspaceId: number, rows: Candidate[], transaction?: import('sequelize').Transaction): Promise<void> {
  const ok = rows.filter((r) => r.value);
  if (ok.length === 0) return;
  const stored = await AbsenceRow.findAll({
    where: { workspaceId, personId: [...new Set(ok.map((r) => r.value!.personId))], status: { [Op.ne]: 'declined' } },
    transaction,
    ...(transaction ? { lock: transaction.LOCK.UPDATE } : {}),
  });
  const seen: Candidate[] = [];
  for (const r of ok) {
    const v = r.value!;
    const span = absenceSpan(v);
    const clash = stored.find((s) => s.personId === v.personId && spansOverlap(span, absenceSpan(s)));
    if (clash) r.report.errors.push({ column: 'start_date', message: `overlaps ${describeAbsence(clash)} already on record (${clash.status})` });
    const twin = seen.find((o) => o.value!.personId === v.personId && spansOverlap(span, absenceSpan(o.value!)));
    if (twin) r.report.errors.push({ column: 'start_date', message: `overlaps row ${twin.report.row} of this file` });
    if (r.report.errors.length) r.value = null;
    else seen.push(r);
  }
}

const summary = (rows: Candidate[], committed: boolean): AbsenceImportReport => {
  const invalid = rows.filter((r) => r.report.errors.length > 0).length;
  return { rows: rows.map((r) => r.report), valid: rows.length - invalid, invalid, canCommit: invalid === 0 && rows.length > 0, committed };
};

/**
 * Preview (commit false) or import. An import is all or nothing: with any row in error nothing is
 * saved (422 with the report); otherwise every row is saved approved, in one transaction that
 * holds the people's locks and re-checks overlaps, so a create in between cannot slip past.
 */
export async function importAbsences(workspaceId: number, body: { csv: string; commit: boolean }, userId: number): Promise<AbsenceImportReport> {
  const rows = await readRows(workspaceId, body.csv);
  if (rows.length === 0) throw csvError('The file has a header row but no absences.');
  await checkOverlaps(workspaceId, rows);
  const preview = summary(rows, false);
  if (!body.commit) return preview;
  if (!preview.canCommit) {
    throw Object.assign(new HttpError(422, 'unprocessable', `${preview.invalid} of ${rows.length} rows have problems; nothing was imported. Fix them and try again.`, [{ path: 'body.csv', message: `${preview.invalid} rows with errors` }]), { report: preview });
  }
  return AbsenceRow.sequelize!.transaction(async (t) => {
    await lockPeople(t, workspaceId, rows.map((r) => r.value!.personId), 'body.csv');
    await checkOverlaps(workspaceId, rows, t);
    const again = summary(rows, false);
    if (!again.canCommit) throw Object.assign(new HttpError(409, 'conflict', 'Absences were added while you were importing, and some rows now overlap them; nothing was imported. Preview the file again.', [{ path: 'body.csv', message: 'overlaps appeared meanwhile' }]), { report: again });
    const now = new Date();
    await AbsenceRow.bulkCreate(
      rows.map((r) => ({ workspaceId, ...r.value!, status: 'approved' as const, requestedByUserId: userId, decidedByUserId: userId, decidedAt: now })),
      { transaction: t },
    );
    return summary(rows, true);
  });
}
