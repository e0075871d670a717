import { Op } from 'sequelize';
import { rosterIds } from '../rosters/ids';
import { AssignmentRow, RunRow } from '../rosters/models';
import type { Roster, RosterAssignment } from '../../shared/roster/schema';

/**
 * Where a re-solve starts: the roster's latest finished run (solved or saved by hand). Starting
 * there keeps a re-solve close to what the coordinator has been looking at; solveRoster lays
 * today's pins over it (withPins) and keeps the greedy start when this one scores worse.
 * Undefined when there is no earlier roster.
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
  return start;
}
