import { describe, expect, it } from 'vitest';
import { createPersonBody, skillBody } from '../../../shared/api/people';
import { createRosterBody, patternBody, shiftBody, wishBody, pairingBody, updateRosterBody } from '../../../shared/api/rosters';

/**
 * Issue 13, item 8: names, labels and notes that reach CSV (RFC 4180) and iCalendar (RFC 5545
 * §3.1, where CR LF ends a content line and a bare CR breaks it) refuse control characters at
 * validation, naming the field. Notes may keep line feeds (iCalendar escapes them as \n).
 */
describe('control characters are refused in names, labels and notes', () => {
  const bad = ['a\rb', 'a\u0000b', 'a\nb', 'tab\there', 'bell\u0007', 'del\u007f', 'c1\u0085', 'line\u2028sep'];
  const roster = { name: 'R', periodStart: '2027-03-01', periodEnd: '2027-03-07', timeZone: 'Europe/London' };
  const pattern = { label: 'early', weekdays: ['mon'], startTime: '07:00', endTime: '15:00', seats: [{ skillId: null, count: 1 }] };
  const shift = { label: 'early', startsLocal: '2027-03-01T07:00', endsLocal: '2027-03-01T15:00', seats: [{ skillId: null }] };
  const cases: Array<[string, (v: string) => { success: boolean; error?: { issues: Array<{ path: PropertyKey[] }> } }, string]> = [
    ['person name', (v) => createPersonBody.safeParse({ name: v, contractedHours: 1 }), 'name'],
    ['skill name', (v) => skillBody.safeParse({ name: v }), 'name'],
    ['roster name', (v) => createRosterBody.safeParse({ ...roster, name: v }), 'name'],
    ['roster rename', (v) => updateRosterBody.safeParse({ version: 1, name: v }), 'name'],
    ['pattern label', (v) => patternBody.safeParse({ ...pattern, label: v }), 'label'],
    ['shift label', (v) => shiftBody.safeParse({ ...shift, label: v }), 'label'],
  ];
  for (const [what, parse, field] of cases) {
    it(`refuses them in a ${what}, naming ${field}`, () => {
      for (const v of bad) {
        const r = parse(v);
        expect(r.success, JSON.stringify(v)).toBe(false);
        expect(r.error!.issues.map((i) => i.path.join('.'))).toContain(field);
      }
      expect(parse('Ada Quill-Øster').success).toBe(true);
    });
  }
  it('lets notes keep line feeds and tabs, and refuses CR, NUL and the rest', () => {
    const wish = (note: string) => wishBody.safeParse({ personId: 1, date: '2027-03-02', kind: 'avoid', note });
    expect(wish('line one\nline two\twith a tab').success).toBe(true);
    for (const v of ['a\rb', 'a\u0000b', 'bell\u0007', 'c1\u0085']) expect(wish(v).success, JSON.stringify(v)).toBe(false);
    expect(pairingBody.safeParse({ personAId: 1, personBId: 2, reason: 'bad\r' }).success).toBe(false);
  });
});
