/**
 * iCalendar (RFC 5545) files for published shifts, written by hand: one VCALENDAR with one
 * VEVENT per shift (per person or for everyone). Times are written in UTC (RFC 5545 §3.3.5,
 * "FORM #2"), so no VTIMEZONE is needed and a night across a DST change keeps its true length.
 */

export interface CalendarEvent {
  uid: string;
  /** Instants in ms since the epoch. */
  start: number;
  end: number;
  summary: string;
  description?: string;
  location?: string;
}

const CRLF = '\r\n';

/** 20270104T070000Z */
export function icalUtc(ms: number): string {
  return new Date(ms).toISOString().replace(/[-:]/g, '').replace(/\.\d{3}Z$/, 'Z');
}

/** TEXT values (§3.3.11): backslash, semicolon, comma and newlines escaped. */
export function escapeText(s: string): string {
  return s.replace(/\\/g, '\\\\').replace(/;/g, '\\;').replace(/,/g, '\\,').replace(/\r?\n/g, '\\n');
}

/**
 * Content lines longer than 75 octets are folded (§3.1): CRLF then one space. Counted in UTF-8
 * octets, and never inside a multi-byte character.
 */
export function foldLine(line: string): string {
  const out: string[] = [];
  let current = '';
  let octets = 0;
  for (const ch of line) {
    const size = Buffer.byteLength(ch, 'utf8');
    // The first line holds 75 octets; continuation lines start with a space, so they hold 74 more.
    const limit = out.length === 0 ? 75 : 74;
    if (octets + size > limit) {
      out.push(current);
      current = '';
      octets = 0;
    }
    current += ch;
    octets += size;
  }
  out.push(current);
  return out.join(`${CRLF} `);
}

export function buildCalendar(input: { name: string; events: CalendarEvent[]; now?: Date }): string {
  const stamp = icalUtc((input.now ?? new Date()).getTime());
  const lines: string[] = [
    'BEGIN:VCALENDAR',
    'VERSION:2.0',
    'PRODID:-//Rotaloom//Published roster//EN',
    'CALSCALE:GREGORIAN',
    'METHOD:PUBLISH',
    `X-WR-CALNAME:${escapeText(input.name)}`,
  ];
  for (const e of input.events) {
    lines.push(
      'BEGIN:VEVENT',
      `UID:${e.uid}`,
      `DTSTAMP:${stamp}`,
      `DTSTART:${icalUtc(e.start)}`,
      `DTEND:${icalUtc(e.end)}`,
      `SUMMARY:${escapeText(e.summary)}`,
      ...(e.description ? [`DESCRIPTION:${escapeText(e.description)}`] : []),
      ...(e.location ? [`LOCATION:${escapeText(e.location)}`] : []),
      'TRANSP:OPAQUE',
      'END:VEVENT',
    );
  }
  lines.push('END:VCALENDAR');
  return lines.map(foldLine).join(CRLF) + CRLF;
}

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
