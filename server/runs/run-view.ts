import { HttpError, notFound } from '../http/errors';
import { assembleRoster } from '../rosters/assemble';
import { rosterIds } from '../rosters/ids';
import { AssignmentRow, RunRow } from '../rosters/models';
import type { Roster as RosterJson, RosterAssignment } from '../../shared/roster/schema';

export async function findRun(workspaceId: number, id: number): Promise<RunRow> {
  const run = await RunRow.findOne({ where: { id, workspaceId } });
  if (!run) throw notFound('Run');
  return run;
}

/** The roster as it stands now, valid, or a 422 naming the first problem. */
export async function currentRoster(workspaceId: number, rosterId: number): Promise<{ roster: RosterJson; version: number }> {
  const { parsed, version } = await assembleRoster(workspaceId, rosterId);
  if (!parsed.ok) {
    throw new HttpError(422, 'unprocessable', `The roster has problems to fix first: ${parsed.issues[0].path}: ${parsed.issues[0].message}`, parsed.issues.map((i) => ({ path: `roster.${i.path}`, message: i.message })));
  }
  return { roster: parsed.roster, version };
}

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
