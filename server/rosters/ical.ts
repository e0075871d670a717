/** RFC 4180 CSV: fields with a comma, quote or line break are quoted, quotes doubled; CRLF rows. */
export function buildCsv(rows: Array<Array<string | number>>): string {
  const cell = (v: string | number) => {
    const s = String(v);
    // A leading = + - @ would run as a formula in spreadsheet programs; a quote mark keeps it text.
    const safe = /^[=+\-@]/.test(s) ? `'${s}` : s;
    return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
  };
  return rows.map((r) => r.map(cell).join(',')).join('\r\n') + '\r\n';
}
