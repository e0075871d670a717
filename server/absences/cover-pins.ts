import { rosterIds } from '../rosters/ids';
import type { Roster } from '../../shared/roster/schema';

/** What a cover run carries in its parameters (runs.parameters JSON), read by the worker. */
export interface CoverParameters {
  cover?: {
    /** The run whose seats are kept. */
    baseRunId: number;
    /** Every seat of the base run but the freed ones, with its holder (null = it stays open). */
    pins: Array<{ seatId: number; personId: number | null }>;
    /** Seats an approved absence takes away, with the absent holder. */
    freed: Array<{ seatId: number; personId: number }>;
  };
}

/**
 * The roster with a cover run's pins laid over its own: the kept seats are pinned to their holders,
 * and a coordinator's pin that put the absent person on a freed seat is dropped (it is what needs
 * cover). Seats or people no longer in the roster are skipped. Without `cover` the roster is returned as is.
 */
export function withCoverPins(roster: Roster, parameters: unknown): Roster {
  const cover = (parameters as CoverParameters | null)?.cover;
  if (!cover) return roster;
  const seats = new Set(roster.seats.map((s) => s.id));
  const people = new Set(roster.people.map((p) => p.id));
  const kept = cover.pins
    .map((p) => ({ seat: rosterIds.seat(p.seatId), person: p.personId === null ? null : rosterIds.person(p.personId) }))
    .filter((p) => seats.has(p.seat) && (p.person === null || people.has(p.person)));
  const keptSeats = new Set(kept.map((p) => p.seat));
  const absentOn = new Map(cover.freed.map((f) => [rosterIds.seat(f.seatId), rosterIds.person(f.personId)]));
  const own = roster.pins.filter((p) => !keptSeats.has(p.seat) && !(absentOn.has(p.seat) && absentOn.get(p.seat) === p.person));
  return { ...roster, pins: [...own, ...kept] };
}

/** Seat ids (database) a cover run pins, for the run's `pinned` flags. */
export function coverPinnedSeats(parameters: unknown): number[] {
  return ((parameters as CoverParameters | null)?.cover?.pins ?? []).map((p) => p.seatId);
}
