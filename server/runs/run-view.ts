import { HttpError } from '../http/errors';
import { assembleValidRoster } from '../rosters/assemble';
import { rosterIds } from '../rosters/ids';
import { AssignmentRow, type RunRow } from '../rosters/models';
import { findRun } from './repository';
import type { Roster as RosterJson, RosterAssignment } from '../../shared/roster/schema';

/** The roster as it stands now, valid, or a 422 naming the problems (server/rosters/assemble.ts). */
export const currentRoster = assembleValidRoster;

/**
 * A finished run's roster (seat → person, in roster JSON ids) next to the roster as it stands
 * now. Seats deleted since the run are left out; seats added since are open.
 */
export async function runAssignment(workspaceId: number, runId: number): Promise<{ run: RunRow; roster: RosterJson; version: number; assignment: RosterAssignment }> {
  const run = await findRun(workspaceId, runId);
  if (run.status !== 'done' && run.status !== 'cancelled') {
    throw new HttpError(409, 'conflict', run.status === 'failed' ? 'This run failed, so it has no roster to look at.' : 'This run has not finished yet.');
  }
  const { roster, version } = await currentRoster(workspaceId, run.rosterId);
  const rows = await AssignmentRow.findAll({ where: { runId: run.id, workspaceId } });
  if (rows.length === 0) throw new HttpError(409, 'conflict', 'This run kept no roster (it stopped before finding one).');
  const known = new Set(roster.seats.map((s) => s.id));
  const assignment: RosterAssignment = {};
  for (const seat of roster.seats) assignment[seat.id] = null;
  for (const r of rows) {
    const key = rosterIds.seat(r.seatId);
    if (known.has(key)) assignment[key] = r.personId === null ? null : rosterIds.person(r.personId);
  }
  return { run, roster, version, assignment };
}
