import { dayLabel, localDateOf, timeLabel } from './format';

/**
 * The line above shifts read from the phone's saved copy, with when it was saved in the
 * workspace's zone (the zone the shifts are shown in); the day too when it was not today.
 * The service worker answers from the copy only when the network request itself failed (a server
 * error still comes through), so "offline" is what happened as far as the phone can tell;
 * navigator.onLine is not asked, browsers report it unreliably.
 */
export function offlineLine(savedAt: string, timeZone: string, now = new Date()): string {
  const today = localDateOf(now.toISOString(), timeZone) === localDateOf(savedAt, timeZone);
  const when = today ? timeLabel(savedAt, timeZone) : `${dayLabel(savedAt, timeZone)}, ${timeLabel(savedAt, timeZone)}`;
  return `You are offline — showing shifts as of ${when}`;
}
