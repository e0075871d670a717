import { describe, expect, it } from 'vitest';
import { buildCalendar, localTimeRepeats } from '../../../server/exports/ical';
import { readCalendar, readEvents } from '../helpers/ical-read';

const stamp = new Date(Date.UTC(2027, 0, 1, 9, 30));
const lines = (text: string) => text.split('\r\n');

// RFC 5545 §3.1 (CRLF, folding at 75 octets), §3.3.11 (TEXT escapes), §3.3.5 (DATE-TIME forms),
// §3.6.5 (VTIMEZONE). ical.js, an independent RFC 5545 parser from npm, reads every file back.
describe('iCalendar writer (RFC 5545)', () => {
  it('folds long lines at 75 octets without splitting a multi-byte character; ical.js unfolds them intact', () => {
    const description = `${'é'.repeat(50)}${'€'.repeat(30)}${'x'.repeat(40)}`;
    const text = buildCalendar({ name: 'Folding', product: 'Test', events: [{ uid: 'f@rotaloom', start: 0, end: 3_600_000, stamp, summary: 'Long', description }] });
    expect(text.endsWith('\r\n')).toBe(true);
    expect(text.replace(/\r\n/g, '').includes('\n')).toBe(false);
    for (const l of lines(text)) expect(Buffer.byteLength(l, 'utf8')).toBeLessThanOrEqual(75);
    expect(text).toMatch(/\r\n /);
    expect(text).not.toContain('\uFFFD');
    expect(readEvents(text)[0].description).toBe(description);
  });

  it('escapes TEXT values: ical.js reads back the name, summary and description as given', () => {
    const name = 'Test; roster, with \\ escapes';
    const text = buildCalendar({
      name,
      product: 'Test',
      events: [
        { uid: 'a@rotaloom', start: Date.UTC(2027, 0, 4, 21, 0), end: Date.UTC(2027, 0, 5, 7, 0), stamp, summary: 'Night, late; shift', description: 'Line one\nLine two; with, punctuation' },
        { uid: 'b@rotaloom', start: Date.UTC(2027, 0, 5, 7, 0), end: Date.UTC(2027, 0, 5, 15, 0), stamp, summary: 'Early shift' },
      ],
    });
    expect(text).toContain('X-WR-CALNAME:Test\\; roster\\, with \\\\ escapes\r\n');
    const cal = readCalendar(text);
    expect(cal.getFirstPropertyValue('version')).toBe('2.0');
    expect(cal.getFirstPropertyValue('prodid')).toBe('-//Rotaloom//Test//EN');
    const events = readEvents(text);
    expect(events.map((e) => e.uid)).toEqual(['a@rotaloom', 'b@rotaloom']);
    expect(events[0]).toMatchObject({ summary: 'Night, late; shift', description: 'Line one\nLine two; with, punctuation', start: '2027-01-04T21:00:00.000Z', end: '2027-01-05T07:00:00.000Z', startZone: null });
  });

  it('writes UTC ("Z" form) and no VTIMEZONE without a zone; DTSTAMP and SEQUENCE as given; same input, same bytes', () => {
    const input = { name: 'Roster', product: 'Test', publish: true, events: [{ uid: 'u@rotaloom', sequence: 7, start: Date.UTC(2027, 0, 4, 7), end: Date.UTC(2027, 0, 4, 15), stamp, summary: 'Early' }] };
    const text = buildCalendar(input);
    expect(lines(text)).toEqual(expect.arrayContaining(['METHOD:PUBLISH', 'DTSTART:20270104T070000Z', 'DTEND:20270104T150000Z', 'DTSTAMP:20270101T093000Z', 'SEQUENCE:7', 'UID:u@rotaloom']));
    expect(text).not.toContain('VTIMEZONE');
    expect(buildCalendar(input)).toBe(text);
  });

  /**
   * Hand-computed from the UK rule (Summer Time Order 2002, as EU Directive 2000/84/EC Arts. 2
   * and 3): BST from 01:00 UTC on the last Sunday of March to 01:00 UTC on the last Sunday of
   * October. In 2027 those Sundays are 28 March and 31 October.
   */
  it('writes local times with TZID and a VTIMEZONE for a zone; ical.js maps them to the same instants on both DST changes', () => {
    const events = [
      // Sat 27 March 21:00 GMT to Sun 28 March 07:00 BST: 9 hours.
      { uid: 'spring@rotaloom', start: Date.parse('2027-03-27T21:00:00Z'), end: Date.parse('2027-03-28T06:00:00Z'), stamp, summary: 'Night' },
      // Sat 30 October 22:00 BST to Sun 31 October 01:30 BST (00:30 UTC), its first occurrence.
      { uid: 'first@rotaloom', start: Date.parse('2027-10-30T21:00:00Z'), end: Date.parse('2027-10-31T00:30:00Z'), stamp, summary: 'Late' },
      // Sun 31 October 02:30 GMT: after the change, shown once.
      { uid: 'after@rotaloom', start: Date.parse('2027-10-31T02:30:00Z'), end: Date.parse('2027-10-31T10:00:00Z'), stamp, summary: 'Day' },
      // Ends 01:30 GMT, the second time the clock shows 01:30. RFC 5545 §3.3.5 reads a repeated
      // TZID time as the first occurrence but ical.js as the later one: both go out in UTC.
      { uid: 'second@rotaloom', start: Date.parse('2027-10-30T21:00:00Z'), end: Date.parse('2027-10-31T01:30:00Z'), stamp, summary: 'Long late' },
    ];
    const text = buildCalendar({ name: 'Feed', product: 'Test', timeZone: 'Europe/London', events });
    const ls = lines(text);
    expect(ls).toEqual(expect.arrayContaining(['TZID:Europe/London', 'DTSTART;TZID=Europe/London:20270327T210000', 'DTEND;TZID=Europe/London:20270328T070000', 'DTEND:20271031T003000Z', 'DTEND:20271031T013000Z', 'DTSTART;TZID=Europe/London:20271031T023000']));
    expect(ls.filter((l) => l === 'BEGIN:VTIMEZONE')).toHaveLength(1);
    // DTSTAMP stays UTC (§3.8.7.2) even when the events are local.
    expect(ls.filter((l) => l.startsWith('DTSTAMP'))).toEqual(Array(4).fill('DTSTAMP:20270101T093000Z'));
    const read = readEvents(text);
    expect(read.map((e) => [e.uid, e.start, e.end, e.startZone])).toEqual([
      ['spring@rotaloom', '2027-03-27T21:00:00.000Z', '2027-03-28T06:00:00.000Z', 'Europe/London'],
      ['first@rotaloom', '2027-10-30T21:00:00.000Z', '2027-10-31T00:30:00.000Z', null],
      ['after@rotaloom', '2027-10-31T02:30:00.000Z', '2027-10-31T10:00:00.000Z', 'Europe/London'],
      ['second@rotaloom', '2027-10-30T21:00:00.000Z', '2027-10-31T01:30:00.000Z', null],
    ]);
  });

  it('tells a local time the clock shows twice from one it shows once (London, and Lord Howe Island whose clock goes back 30 minutes)', () => {
    expect(localTimeRepeats(Date.parse('2027-10-31T00:30:00Z'), 'Europe/London')).toBe(true); // 01:30 BST, shown again an hour later
    expect(localTimeRepeats(Date.parse('2027-10-30T23:30:00Z'), 'Europe/London')).toBe(false); // 00:30 BST, shown once
    expect(localTimeRepeats(Date.parse('2027-10-31T01:30:00Z'), 'Europe/London')).toBe(true); // 01:30 GMT again
    expect(localTimeRepeats(Date.parse('2027-10-31T02:30:00Z'), 'Europe/London')).toBe(false); // 02:30 GMT, shown once
    expect(localTimeRepeats(Date.parse('2027-03-28T01:30:00Z'), 'Europe/London')).toBe(false); // spring: nothing repeats
    // Lord Howe: +11 to +10:30 at 02:00 local on the first Sunday of April (3 April 2027, 15:00 UTC the day before).
    expect(localTimeRepeats(Date.parse('2027-04-03T15:15:00Z'), 'Australia/Lord_Howe')).toBe(true); // 01:45 again
    expect(localTimeRepeats(Date.parse('2027-04-03T14:45:00Z'), 'Australia/Lord_Howe')).toBe(true); // 01:45 the first time
    expect(localTimeRepeats(Date.parse('2027-04-03T14:15:00Z'), 'Australia/Lord_Howe')).toBe(false); // 01:15, shown once
  });

  it('falls back to UTC for a zone name it cannot resolve, without a VTIMEZONE', () => {
    const text = buildCalendar({ name: 'x', product: 'Test', timeZone: 'Nowhere/Atlantis', events: [{ uid: 'z@rotaloom', start: 0, end: 60_000, stamp, summary: 'x' }] });
    expect(text).toContain('DTSTART:19700101T000000Z\r\n');
    expect(text).not.toContain('VTIMEZONE');
  });
});
