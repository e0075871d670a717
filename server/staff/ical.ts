/**
 * iCalendar (RFC 5545) for a person's published shifts. Times are written in UTC ("Z" form,
 * RFC 5545 §3.3.5 form #2), computed from the roster's wall clock through its IANA zone, so a
 * calendar shows them right on either side of a daylight-saving change without a VTIMEZONE.
 */

export interface FeedEvent {
  /** Stable per seat: a re-publish updates the event in place instead of adding another. */
  uid: string;
  /** Rises with every re-publish and every change of the shift (RFC 5545 §3.8.7.4). */
  sequence: number;
  start: Date;
  end: Date;
  /** When this version of the information was made (the publish). */
  stamp: Date;
  lastModified: Date;
  summary: string;
  description: string;
}

const pad = (n: number) => String(n).padStart(2, '0');

/** DATE-TIME in UTC: 20270328T060000Z. */
export function icsUtc(d: Date): string {
  return `${d.getUTCFullYear()}${pad(d.getUTCMonth() + 1)}${pad(d.getUTCDate())}T${pad(d.getUTCHours())}${pad(d.getUTCMinutes())}${pad(d.getUTCSeconds())}Z`;
}

/** TEXT escaping (§3.3.11): backslash, semicolon, comma and line breaks. */
export function icsText(s: string): string {
  return s.replace(/\\/g, '\\\\').replace(/;/g, '\\;').replace(/,/g, '\\,').replace(/\r?\n/g, '\\n');
}

/** Lines longer than 75 octets are folded with CRLF + one space (§3.1), never inside a UTF-8 character. */
export function foldLine(line: string): string {
  const parts: string[] = [];
  let current = '';
  let octets = 0;
  for (const ch of line) {
    const size = Buffer.byteLength(ch, 'utf8');
    const limit = parts.length === 0 ? 75 : 74; // continuation lines start with a space
    if (octets + size > limit) {
      parts.push(current);
      current = '';
      octets = 0;
    }
    current += ch;
    octets += size;
  }
  parts.push(current);
  return parts.join('\r\n ');
}

export function buildCalendar(input: { name: string; events: FeedEvent[] }): string {
  const lines = [
    'BEGIN:VCALENDAR',
    'VERSION:2.0',
    'PRODID:-//Rotaloom//Published shifts//EN',
    'CALSCALE:GREGORIAN',
    `X-WR-CALNAME:${icsText(input.name)}`,
    // Calendar apps that honour it look again every hour, so a re-publish shows up the same day.
    'REFRESH-INTERVAL;VALUE=DURATION:PT1H',
    'X-PUBLISHED-TTL:PT1H',
  ];
  for (const e of input.events) {
    lines.push(
      'BEGIN:VEVENT',
      `UID:${e.uid}`,
      `SEQUENCE:${e.sequence}`,
      `DTSTAMP:${icsUtc(e.stamp)}`,
      `LAST-MODIFIED:${icsUtc(e.lastModified)}`,
      `DTSTART:${icsUtc(e.start)}`,
      `DTEND:${icsUtc(e.end)}`,
      `SUMMARY:${icsText(e.summary)}`,
      `DESCRIPTION:${icsText(e.description)}`,
      'TRANSP:OPAQUE',
      'STATUS:CONFIRMED',
      'END:VEVENT',
    );
  }
  lines.push('END:VCALENDAR');
  return lines.map(foldLine).join('\r\n') + '\r\n';
}
