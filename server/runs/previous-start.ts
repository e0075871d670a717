import { Op } from 'sequelize';
import { rosterIds } from '../rosters/ids';
import { AssignmentRow, RunRow } from '../rosters/models';
import type { Roster, RosterAssignment } from '../../shared/roster/schema';

const DAY_MS = 86_400_000;

/**
 * Where a re-solve starts: the roster's latest finished run (solved or saved by hand), with
 * today's pins laid over it. Starting there keeps a re-solve close to what the coordinator has
 * been looking at, and an alternative they pinned from the seat details starts from the roster
 * that alternative was worked out on. A pinned person is taken off their other seats within a
 * day of the pinned shift (they could not keep both under the rest rules); the local search
 * refills those. Undefined when there is no earlier roster; solveRoster keeps the greedy start
 * when this one scores worse.
 */
export async function previousStart(workspaceId: number, rosterId: number, beforeRunId: number, roster: Roster): Promise<RosterAssignment | undefined> {
  const previous = await RunRow.findOne({
    where: { workspaceId, rosterId, id: { [Op.lt]: beforeRunId }, status: { [Op.in]: ['done', 'cancelled'] } },
    order: [['id', 'DESC']],
    attributes: ['id'],
  });
  if (!previous) return undefined;
  const rows = await AssignmentRow.findAll({ where: { workspaceId, runId: previous.id }, attributes: ['seatId', 'personId'], raw: true });
  if (rows.length === 0) return undefined;
  const start: RosterAssignment = {};
  for (const seat of roster.seats) start[seat.id] = null;
  for (const r of rows) {
    const key = rosterIds.seat(r.seatId);
    if (key in start) start[key] = r.personId === null ? null : rosterIds.person(r.personId);
  }
  return withPins(roster, start);
}

/** The start with every pin applied and the pinned person moved off seats within a day of it. */
export function withPins(roster: Roster, start: RosterAssignment): RosterAssignment {
  const out = { ...start };
  const shiftStart = new Map(roster.shifts.map((s) => [s.id, Date.parse(`${s.start}Z`)]));
  const seatStart = new Map(roster.seats.map((s) => [s.id, shiftStart.get(s.shift) ?? 0]));
  for (const pin of roster.pins) {
    if (!(pin.seat in out)) continue;
    out[pin.seat] = pin.person;
    if (pin.person === null) continue;
    const at = seatStart.get(pin.seat)!;
    for (const seat of roster.seats)
      if (seat.id !== pin.seat && out[seat.id] === pin.person && Math.abs(seatStart.get(seat.id)! - at) < DAY_MS) out[seat.id] = null;
  }
  // A pin elsewhere may have moved someone onto a seat another pin gave them: pins win again.
  for (const pin of roster.pins) if (pin.seat in out) out[pin.seat] = pin.person;
  return out;
}
