import { Op, QueryTypes, type Transaction } from 'sequelize';
import { HttpError, notFound } from '../http/errors';
import { AssignmentRow, RunRow } from '../rosters/models';
import { computeOnWorker, queues, runJobId, type ComputeJobData } from '../queue/queues';
import type { Roster as RosterJson } from '../../shared/roster/schema';
import type { DualStart } from '../../solver/roster/lagrangian';

/** A run of the workspace, or a 404 (another workspace's id included). */
export async function findRun(workspaceId: number, id: number): Promise<RunRow> {
  const run = await RunRow.findOne({ where: { id, workspaceId } });
  if (!run) throw notFound('Run');
  return run;
}

/** A run's id and status only (a cheap read before a compute job), or a 404 naming `params.id`. */
export async function findRunStatus(workspaceId: number, id: number): Promise<Pick<RunRow, 'id' | 'status'>> {
  const run = await RunRow.findOne({ where: { id, workspaceId }, attributes: ['id', 'status'] });
  if (!run) throw new HttpError(404, 'not_found', 'Run not found', [{ path: 'params.id', message: 'no such run in this workspace' }]);
  return run;
}

/** The roster's latest 50 runs, newest first, without their results (the list shows none). */
export function listRosterRuns(workspaceId: number, rosterId: number): Promise<RunRow[]> {
  return RunRow.findAll({ where: { workspaceId, rosterId }, order: [['id', 'DESC']], limit: 50, attributes: { exclude: ['result'] } });
}

/** Seat by seat who a run put where; only finished runs keep assignments. */
export async function runAssignments(run: RunRow): Promise<Array<{ seatId: number; personId: number | null; pinned: boolean }>> {
  if (run.status !== 'done' && run.status !== 'cancelled') return [];
  const rows = await AssignmentRow.findAll({ where: { runId: run.id }, order: [['seatId', 'ASC']], raw: true });
  return rows.map((a) => ({ seatId: a.seatId, personId: a.personId ?? null, pinned: Boolean(a.pinned) }));
}

/**
 * Cancels a run. The row decides: a queued run is cancelled at once (a worker that takes its job
 * ends it unsolved); a running one is flagged and its worker stops the solver within about 0.4 s,
 * keeping the best roster found so far. Status is part of the update's condition, so a run that
 * started between the read and the write is flagged rather than marked cancelled under its worker.
 */
export async function cancelRun(workspaceId: number, id: number): Promise<RunRow> {
  const where = { id, workspaceId };
  const run = await RunRow.findOne({ where });
  if (!run) throw notFound('Run');
  if (run.status !== 'queued' && run.status !== 'running') throw new HttpError(409, 'conflict', `This run has already ${run.status === 'done' ? 'finished' : run.status}`);
  let changed = 0;
  if (run.status === 'queued') {
    [changed] = await RunRow.update({ status: 'cancelled', cancelRequested: true, finishedAt: new Date(), error: 'Cancelled before it started' }, { where: { ...where, status: 'queued' } });
    if (changed) await queues(RunRow.sequelize!).runs.remove(runJobId(run.id)).catch(() => {});
  }
  if (!changed) await RunRow.update({ cancelRequested: true }, { where: { ...where, status: { [Op.in]: ['queued', 'running'] } } });
  const now = (await RunRow.findOne({ where }))!;
  if (!now.cancelRequested) throw new HttpError(409, 'conflict', 'This run finished just before it could be cancelled');
  return now;
}

/** A price or seat alternatives worked out by a worker (server/queue/queues.ts), the request waiting for the answer. */
export function computeForRun(data: ComputeJobData, timeoutMs: number, what: string): Promise<unknown> {
  return computeOnWorker(RunRow.sequelize!, data, timeoutMs, what);
}

/** Stores the roster JSON a run solves (migration 0015), in the transaction that creates the run. */
export async function saveRunRoster(runId: number, roster: RosterJson, transaction: Transaction): Promise<void> {
  await RunRow.sequelize!.query('UPDATE runs SET roster = ? WHERE id = ?', { replacements: [JSON.stringify(roster), runId], transaction });
}

/** The roster JSON stored with a run; null for a run written before rosters were kept with their runs. */
export async function loadRunRoster(runId: number): Promise<RosterJson | null> {
  const rows = await RunRow.sequelize!.query<{ roster: string | RosterJson | null }>('SELECT roster FROM runs WHERE id = ?', { replacements: [runId], type: QueryTypes.SELECT });
  const raw = rows[0]?.roster ?? null;
  return typeof raw === 'string' ? (JSON.parse(raw) as RosterJson) : raw;
}

/** Stores the multipliers a run's bound ended with (migration 0016), in the transaction that saves its result. (DUAL is a reserved word in MariaDB: quoted.) */
export async function saveRunDual(runId: number, dual: DualStart | null, transaction: Transaction): Promise<void> {
  await RunRow.sequelize!.query('UPDATE runs SET `dual` = ? WHERE id = ?', { replacements: [dual ? JSON.stringify(dual) : null, runId], transaction });
}

/**
 * The multipliers of the roster's latest finished run before `beforeRunId` that kept some: the
 * next run's bound starts there (solveRoster's dualStart). Any multipliers give a proven bound,
 * so a roster changed since only makes the start less useful, never wrong.
 */
export async function previousDual(workspaceId: number, rosterId: number, beforeRunId: number): Promise<DualStart | undefined> {
  const rows = await RunRow.sequelize!.query<{ dual: string | DualStart | null }>(
    "SELECT `dual` FROM runs WHERE workspace_id = ? AND roster_id = ? AND id < ? AND status IN ('done', 'cancelled') AND `dual` IS NOT NULL ORDER BY id DESC LIMIT 1",
    { replacements: [workspaceId, rosterId, beforeRunId], type: QueryTypes.SELECT },
  );
  const raw = rows[0]?.dual ?? null;
  const dual = typeof raw === 'string' ? (JSON.parse(raw) as DualStart) : raw;
  return dual && typeof dual === 'object' && dual.mu && dual.nu ? dual : undefined;
}
