import { QueryTypes, type Transaction } from 'sequelize';
import { HttpError } from '../http/errors';
import { ROSTER_LIMITS } from '../../shared/roster/schema';
import { SeatRow } from './models';

/**
 * Seats one shift of a pattern may have (the sum of its seat counts). The body's own limits (50
 * seat kinds of up to 100 each, over a year) allowed about 1.8 million seat rows in one
 * transaction and a 6 MB preview; a roster holds at most ROSTER_LIMITS.seats in all.
 */
export const MAX_SEATS_PER_SHIFT = 100;

const WEEKDAYS = ['sun', 'mon', 'tue', 'wed', 'thu', 'fri', 'sat'] as const;

/** Days of the period on one of `weekdays`, counted without making any shift. */
export function matchingDays(periodStart: string, periodEnd: string, weekdays: readonly string[]): number {
  const wanted = new Set(weekdays);
  const start = Date.parse(`${periodStart}T00:00:00Z`);
  const end = Date.parse(`${periodEnd}T00:00:00Z`);
  let days = 0;
  for (let t = start; t <= end; t += 86_400_000) if (wanted.has(WEEKDAYS[new Date(t).getUTCDay()])) days++;
  return days;
}

/**
 * Refuses a pattern whose shifts would go past the seat bounds, before any shift is made: 400
 * naming `body.seats` for too many seats on one shift, 422 when the roster would hold more than
 * its limit. Pass the transaction that holds the roster's lock when creating.
 */
export async function requireSeatRoom(
  workspaceId: number,
  roster: { id: number; periodStart: string; periodEnd: string },
  body: { weekdays: readonly string[]; seats: ReadonlyArray<{ count: number }> },
  transaction?: Transaction,
): Promise<void> {
  const perShift = body.seats.reduce((sum, s) => sum + s.count, 0);
  if (perShift > MAX_SEATS_PER_SHIFT) {
    const message = `A shift has at most ${MAX_SEATS_PER_SHIFT} seats; these add up to ${perShift}`;
    throw new HttpError(400, 'validation_failed', message, [{ path: 'body.seats', message }]);
  }
  const adding = perShift * matchingDays(roster.periodStart, roster.periodEnd, body.weekdays);
  const [row] = await SeatRow.sequelize!.query<{ n: number }>('SELECT COUNT(*) AS n FROM seats s JOIN shifts sh ON sh.id = s.shift_id WHERE sh.roster_id = ? AND sh.workspace_id = ?', {
    replacements: [roster.id, workspaceId],
    type: QueryTypes.SELECT,
    transaction,
  });
  const existing = Number(row?.n ?? 0);
  if (existing + adding > ROSTER_LIMITS.seats) {
    const message = `This pattern makes ${adding} seats and the roster has ${existing}; a roster holds at most ${ROSTER_LIMITS.seats}`;
    throw new HttpError(422, 'unprocessable', `${message}. Use fewer seats, fewer weekdays or a shorter period.`, [{ path: 'body.seats', message }]);
  }
}
