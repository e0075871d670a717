import { describe, expect, it } from 'vitest';
import { offlineLine } from '../../components/staff/offline-line';

/** The wall clock as the platform's own Intl (ICU's time-zone data) reads it, not date-fns. */
const hhmm = (iso: string, timeZone: string) =>
  new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(new Date(iso));

describe('the offline line above saved shifts', () => {
  it('names the time the copy was saved in the workspace zone, across a DST change (Europe/London BST, Pacific/Auckland NZDT)', () => {
    const cases = [
      { savedAt: '2027-02-01T08:14:00Z', zone: 'Europe/London', now: '2027-02-01T12:00:00Z' },
      { savedAt: '2027-07-01T07:14:00Z', zone: 'Europe/London', now: '2027-07-01T09:00:00Z' },
      { savedAt: '2027-01-10T19:05:00Z', zone: 'Pacific/Auckland', now: '2027-01-10T20:00:00Z' },
    ];
    for (const c of cases) {
      expect(offlineLine(c.savedAt, c.zone, new Date(c.now))).toBe(`You are offline — showing shifts as of ${hhmm(c.savedAt, c.zone)}`);
    }
    expect(hhmm('2027-07-01T07:14:00Z', 'Europe/London')).toBe('08:14');
  });

  it('adds the day when the copy is from an earlier day there (1 Feb 2027 is a Monday)', () => {
    const line = offlineLine('2027-02-01T22:30:00Z', 'Europe/London', new Date('2027-02-03T09:00:00Z'));
    expect(line).toBe('You are offline — showing shifts as of Mon 1 Feb, 22:30');
    // 22:30 UTC on 1 Feb is already 2 Feb in Auckland (UTC+13): the day follows the zone
    expect(offlineLine('2027-02-01T22:30:00Z', 'Pacific/Auckland', new Date('2027-02-02T09:00:00Z'))).toBe(`You are offline — showing shifts as of ${hhmm('2027-02-01T22:30:00Z', 'Pacific/Auckland')}`);
  });
});
