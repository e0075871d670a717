import { describe, expect, it } from 'vitest';
import ICAL from 'ical.js';
import { buildCalendar, buildCsv, escapeText, foldLine, icalUtc } from '../../../server/rosters/ical';

// RFC 5545 §3.1: lines end in CRLF and are folded at 75 octets by CRLF + one space; §3.3.11 TEXT escapes.
// ical.js (an independent RFC 5545 parser from npm) reads the files back.
describe('iCalendar writer (RFC 5545)', () => {
  it('folds at 75 octets without splitting a multi-byte character, and unfolding restores the line', () => {
    const line = `DESCRIPTION:${'é'.repeat(50)}${'€'.repeat(30)}${'x'.repeat(40)}`;
    const folded = foldLine(line);
    const parts = folded.split('\r\n');
    expect(parts.length).toBeGreaterThan(2);
    for (const p of parts) expect(Buffer.byteLength(p, 'utf8')).toBeLessThanOrEqual(75);
    for (const p of parts.slice(1)) expect(p.startsWith(' ')).toBe(true);
    expect(parts.map((p, i) => (i === 0 ? p : p.slice(1))).join('')).toBe(line);
    expect(folded).not.toContain('\uFFFD');
  });

  it('escapes TEXT values and writes UTC date-times', () => {
    expect(escapeText('a,b;c\\d\ne')).toBe('a\\,b\\;c\\\\d\\ne');
    expect(icalUtc(Date.UTC(2027, 0, 4, 7, 0, 0))).toBe('20270104T070000Z');
  });

  it('makes a calendar ical.js reads back with the same events', () => {
    const text = buildCalendar({
      name: 'Test; roster, with escapes',
      now: new Date(Date.UTC(2027, 0, 1)),
      events: [
        { uid: 'a@rotaloom', start: Date.UTC(2027, 0, 4, 21, 0), end: Date.UTC(2027, 0, 5, 7, 0), summary: 'Night shift', description: 'Line one\nLine two; with, punctuation' },
        { uid: 'b@rotaloom', start: Date.UTC(2027, 0, 5, 7, 0), end: Date.UTC(2027, 0, 5, 15, 0), summary: 'Early shift' },
      ],
    });
    const cal = new ICAL.Component(ICAL.parse(text));
    expect(cal.getFirstPropertyValue('version')).toBe('2.0');
    const events = cal.getAllSubcomponents('vevent').map((c) => new ICAL.Event(c));
    expect(events.map((e) => e.uid)).toEqual(['a@rotaloom', 'b@rotaloom']);
    expect(events[0].description).toBe('Line one\nLine two; with, punctuation');
    expect(events[0].startDate.toJSDate().toISOString()).toBe('2027-01-04T21:00:00.000Z');
    expect(events[0].endDate.toJSDate().toISOString()).toBe('2027-01-05T07:00:00.000Z');
    expect(text.split('\r\n').every((l) => Buffer.byteLength(l) <= 75)).toBe(true);
  });

  it('writes RFC 4180 CSV: quotes fields with commas or quotes, keeps formulas as text', () => {
    expect(buildCsv([['a', 'b,c', 'say "hi"'], ['=SUM(A1)', 1]])).toBe('a,"b,c","say ""hi"""\r\n\'=SUM(A1),1\r\n');
  });
});
