/**
 * Model assignment ↔ readable roster.
 */
import type { RosterAssignment } from '../../shared/roster/schema';
import { contractedTarget, periodDays } from '../../shared/roster/derive';
import { bestAux, OPEN, type CompiledRoster } from './compile';

export type DecodedSeat = {
  seatId: string;
  shiftId: string;
  patternLabel: string;
  date: string;
  start: string;
  end: string;
  skill: string | null;
  personId: string | null;
  personName: string | null;
};

export type PersonSummary = {
  personId: string;
  name: string;
  shifts: number;
  hours: number;
  nights: number;
  weekendShifts: number;
  /** Contracted hours over the period (hours/week × days/7), when the person has a contract. */
  contractedHours?: number;
};

export type DecodedRoster = {
  /** seat id → person id or null (open): the form scoreRoster and the server take. */
  assignment: RosterAssignment;
  /** Every seat in shift-start order. */
  seats: DecodedSeat[];
  openSeats: DecodedSeat[];
  people: PersonSummary[];
};

/** Model values (seat variables first, any aux variables after them) → who works which seat, open seats, per-person hours and nights. */
export function decodeAssignment(compiled: CompiledRoster, x: ArrayLike<number>): DecodedRoster {
  const { roster, facts, domains } = compiled;
  // seat variables first; aux variables after them (compile.ts) say nothing about who works where
  if (x.length < roster.seats.length) throw new Error(`assignment has ${x.length} values; the roster has ${roster.seats.length} seats`);
  const shiftIdx = new Map(roster.shifts.map((s, i) => [s.id, i]));
  const assignment: RosterAssignment = {};
  const people: PersonSummary[] = roster.people.map((p) => ({
    personId: p.id,
    name: p.name,
    shifts: 0,
    hours: 0,
    nights: 0,
    weekendShifts: 0,
    ...(contractedTarget(p, periodDays(roster)) !== undefined ? { contractedHours: contractedTarget(p, periodDays(roster)) } : {}),
  }));
  const minutes = roster.people.map(() => 0);
  const seats: DecodedSeat[] = roster.seats.map((seat, s) => {
    const value = x[s];
    if (!Number.isInteger(value) || value < 0 || value >= domains[s].length) throw new Error(`value ${value} out of range for seat ${seat.id}`);
    const p = domains[s][value];
    const sh = roster.shifts[shiftIdx.get(seat.shift)!];
    const f = facts[shiftIdx.get(seat.shift)!];
    assignment[seat.id] = p === OPEN ? null : roster.people[p].id;
    if (p !== OPEN) {
      const ps = people[p];
      ps.shifts++;
      minutes[p] += f.minutes;
      if (f.night) ps.nights++;
      if (f.weekend) ps.weekendShifts++;
    }
    return {
      seatId: seat.id,
      shiftId: sh.id,
      patternLabel: sh.patternLabel,
      date: f.date,
      start: sh.start,
      end: sh.end,
      skill: seat.skill,
      personId: p === OPEN ? null : roster.people[p].id,
      personName: p === OPEN ? null : roster.people[p].name,
    };
  });
  people.forEach((ps, p) => (ps.hours = minutes[p] / 60));
  const order = seats.map((_, s) => s).sort((a, b) => facts[shiftIdx.get(seats[a].shiftId)!].startMs - facts[shiftIdx.get(seats[b].shiftId)!].startMs || a - b);
  const sorted = order.map((s) => seats[s]);
  return { assignment, seats: sorted, openSeats: sorted.filter((s) => s.personId === null), people };
}

/**
 * Readable roster → model values, for scoring a hand-edited roster through the model or
 * starting a run from it. Returns the seats whose person is not in the seat's domain
 * (wrong skill, a `cannot` wish, against a pin) instead of values when any is.
 */
export function encodeAssignment(
  compiled: CompiledRoster,
  assignment: RosterAssignment,
): { ok: true; values: Int32Array } | { ok: false; seats: string[] } {
  // every model variable: seats from the roster, aux variables at their best (bestAux)
  const values = new Int32Array(compiled.model.variables.length);
  const bad: string[] = [];
  compiled.roster.seats.forEach((seat, s) => {
    const pid = assignment[seat.id];
    const p = pid === null || pid === undefined ? OPEN : (compiled.personIndex.get(pid) ?? -2);
    const x = compiled.domains[s].indexOf(p);
    if (x < 0) bad.push(seat.id);
    else values[s] = x;
  });
  return bad.length ? { ok: false, seats: bad } : { ok: true, values: bestAux(compiled, values) };
}
