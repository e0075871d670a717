import { stringify } from 'csv-stringify/sync';

/**
 * The one CSV writer (RFC 4180, section 2): people exports and roster exports. csv-stringify does
 * the quoting: a field with a comma, a quote or a line break is quoted, its quotes doubled, and
 * every record ends in CRLF.
 */

/**
 * A cell a spreadsheet program would run as a formula (=, +, -, @, or a tab or carriage return
 * first, OWASP "CSV injection") gets a leading apostrophe, which the programs show as text.
 * `unguardFormula` takes one off again when Rotaloom reads its own file back. Text that already
 * starts with apostrophes before such a character gets one more, so reading back is exact.
 */
const GUARDED = /^'*[=+\-@\t\r]/;
export const guardFormula = (value: string) => (GUARDED.test(value) ? `'${value}` : value);
export const unguardFormula = (cell: string) => (cell.startsWith("'") && GUARDED.test(cell.slice(1)) ? cell.slice(1) : cell);

export function buildCsv(rows: Array<Array<string | number>>, options: { bom?: boolean } = {}): string {
  return stringify(rows, {
    record_delimiter: 'windows',
    // Numbers are our own values (hours, counts), never a formula, so only text is guarded:
    // a negative number stays a number in the spreadsheet.
    cast: { string: guardFormula },
    // csv-stringify quotes a line break only when it is the whole record delimiter (CRLF), but
    // RFC 4180 rule 6 wants any CR or LF quoted. Semicolons are quoted too: spreadsheet programs
    // in many locales split on them, and the people import guesses the delimiter from the header.
    quoted_match: /[\r\n;]/,
    // A byte order mark lets spreadsheet programs read UTF-8 (accents) instead of a legacy code page.
    bom: options.bom ?? false,
  });
}
