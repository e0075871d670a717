import { TZDate } from '@date-fns/tz';
import { ICalCalendar, ICalCalendarMethod, ICalEventStatus, ICalEventTransparency } from 'ical-generator';
import { tzlib_get_ical_block } from 'timezones-ical-library';

/**
 * The one iCalendar (RFC 5545) writer: roster exports and staff feeds. ical-generator does the
 * content lines, TEXT escaping (§3.3.11) and folding at 75 octets (§3.1); timezones-ical-library
 * supplies the VTIMEZONE (§3.6.5) for a zone. Nothing here reads the clock, so the same input
 * always gives the same bytes (a published roster's files must not change between downloads).
 */

export interface CalendarEvent {
  /** Stable per shift or seat: a calendar updates the event in place instead of adding another. */
  uid: string;
  /** Instants (ms since the epoch or Date). */
  start: number | Date;
  end: number | Date;
  /** When this version of the information was made: stored data (a publish), never "now". */
  stamp: Date;
  /** Rises with every change the receiver should take over (§3.8.7.4); 0 when never re-issued. */
  sequence?: number;
  lastModified?: Date;
  summary: string;
  description?: string;
  location?: string;
  confirmed?: boolean;
}

export interface CalendarInput {
  name: string;
  /** The PRODID's product part, so a reader can tell a roster file from a feed. */
  product: string;
  events: CalendarEvent[];
  /** IANA zone for DTSTART/DTEND with TZID and a VTIMEZONE; absent or UTC writes the "Z" form. */
  timeZone?: string;
  /** METHOD:PUBLISH for one-off files (RFC 5546 §3.2.1); a subscription has no method. */
  publish?: boolean;
  /** Seconds a subscriber should wait before looking again (RFC 7986 REFRESH-INTERVAL). */
  refreshSeconds?: number;
}

const HOUR = 3_600_000;

const offsetMinutes = (ms: number, zone: string) => -new TZDate(ms, zone).getTimezoneOffset();

/**
 * Whether the wall clock in the zone shows this instant's local time twice (the hour a clock goes
 * back). RFC 5545 §3.3.5 reads such a TZID time as its first occurrence, ical.js as its later
 * one, and our rosters resolve typed local times to the later one (shared/roster/time.ts): readers
 * disagree, so such an instant is written in UTC, which every reader takes the same way.
 */
export function localTimeRepeats(ms: number, zone: string): boolean {
  const now = offsetMinutes(ms, zone);
  // Offsets move by at most a few hours at once, so three hours either side is past any step.
  const dropBefore = offsetMinutes(ms - 3 * HOUR, zone) - now;
  if (dropBefore > 0 && offsetMinutes(ms - dropBefore * 60_000, zone) === now + dropBefore) return true;
  const dropAfter = now - offsetMinutes(ms + 3 * HOUR, zone);
  return dropAfter > 0 && offsetMinutes(ms + dropAfter * 60_000, zone) === now - dropAfter;
}

/** A VTIMEZONE block for the zone, or null when the zone data has none (the feed falls back to UTC). */
function vtimezone(zone: string): string | null {
  // The library logs to the console on a name it does not know, so Intl vets the name first.
  try {
    new Intl.DateTimeFormat('en', { timeZone: zone });
  } catch {
    return null;
  }
  const block = tzlib_get_ical_block(zone);
  return Array.isArray(block) && block[0] ? block[0] : null;
}

export function buildCalendar(input: CalendarInput): string {
  const zone = input.timeZone && input.timeZone !== 'UTC' && vtimezone(input.timeZone) ? input.timeZone : null;
  const cal = new ICalCalendar({
    prodId: { company: 'Rotaloom', product: input.product },
    scale: 'GREGORIAN',
    method: input.publish ? ICalCalendarMethod.PUBLISH : null,
    ttl: input.refreshSeconds ?? null,
    // No calendar-wide zone name: ical-generator would then write DTSTAMP and LAST-MODIFIED in
    // local time, and RFC 5545 §3.8.7.2 wants them in UTC. The generator alone makes the VTIMEZONE
    // for the zones the events name. X-WR-CALNAME goes through x() because x values are escaped.
    timezone: { name: null, generator: vtimezone },
    x: [['X-WR-CALNAME', input.name], ...(zone ? ([['X-WR-TIMEZONE', zone]] as Array<[string, string]>) : [])],
  });
  for (const e of input.events) {
    const start = new Date(e.start).getTime();
    const end = new Date(e.end).getTime();
    const local = zone !== null && !localTimeRepeats(start, zone) && !localTimeRepeats(end, zone);
    cal.createEvent({
      id: e.uid,
      sequence: e.sequence ?? 0,
      stamp: e.stamp,
      lastModified: e.lastModified ?? null,
      // A TZDate carries its zone, so ical-generator writes the wall clock there (not the server's).
      start: local ? new TZDate(start, zone) : new Date(start),
      end: local ? new TZDate(end, zone) : new Date(end),
      timezone: local ? zone : null,
      summary: e.summary,
      description: e.description ?? null,
      location: e.location ?? null,
      transparency: ICalEventTransparency.OPAQUE,
      status: e.confirmed ? ICalEventStatus.CONFIRMED : null,
    });
  }
  // ical-generator stops after END:VCALENDAR; RFC 5545 §3.1 ends every content line with CRLF.
  const text = cal.toString();
  return text.endsWith('\r\n') ? text : `${text}\r\n`;
}
