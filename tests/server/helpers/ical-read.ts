import ICAL from 'ical.js';

/**
 * Reads an iCalendar file with ical.js, an independent RFC 5545 parser from npm. The file's
 * VTIMEZONEs (§3.6.5) are registered first, so a DTSTART;TZID=… is turned into an instant by
 * ical.js from the zone rules the file itself carries, not by our code or the test machine's zone.
 */
export function readCalendar(text: string): ICAL.Component {
  ICAL.TimezoneService.reset();
  const first = new ICAL.Component(ICAL.parse(text));
  for (const vtz of first.getAllSubcomponents('vtimezone')) ICAL.TimezoneService.register(vtz);
  return new ICAL.Component(ICAL.parse(text));
}

export interface ReadEvent {
  uid: string;
  start: string;
  end: string;
  /** The TZID the start was written with, or null for the UTC "Z" form. */
  startZone: string | null;
  sequence: number;
  stamp: string;
  summary: string;
  description: string;
}

export function readEvents(text: string): ReadEvent[] {
  return readCalendar(text)
    .getAllSubcomponents('vevent')
    .map((c) => {
      const e = new ICAL.Event(c);
      return {
        uid: e.uid,
        start: e.startDate.toJSDate().toISOString(),
        end: e.endDate.toJSDate().toISOString(),
        startZone: (c.getFirstProperty('dtstart')?.getParameter('tzid') as string | undefined) ?? null,
        sequence: e.sequence,
        stamp: (c.getFirstPropertyValue('dtstamp') as ICAL.Time).toJSDate().toISOString(),
        summary: e.summary,
        description: e.description,
      };
    });
}
