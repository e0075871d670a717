import { HttpError } from '../http/errors';
import { explainInfeasible } from '../../solver/roster';
import { assembleValidRoster } from '../rosters/assemble';
import { RunRow } from '../rosters/models';
import { withCoverPins } from '../absences/cover-pins';
import { enqueueRun, requireQueue } from '../queue/queues';
import { createRunWithinAllowance, requireTimeLimitWithinPlan } from './fair-use';
import type { Roster as RosterJson } from '../../shared/roster/schema';

/**
 * The roster a run will solve, assembled and validated once: the roster JSON from the database
 * (server/rosters/assemble.ts, 422 naming each problem), a cover run's pins laid over it
 * (server/absences/cover-pins.ts), then the checks in words that need no solver (no shifts;
 * explainInfeasible). The worker solves exactly this roster, stored with the run.
 */
export async function prepareRun(workspaceId: number, rosterId: number, parameters: RunRow['parameters']): Promise<{ roster: RosterJson; version: number }> {
  const assembled = await assembleValidRoster(workspaceId, rosterId);
  const roster = withCoverPins(assembled.roster, parameters);
  if (roster.seats.length === 0) throw new HttpError(422, 'unprocessable', 'This roster has no shifts yet: add a shift pattern or a shift first.', [{ path: 'roster.shifts', message: 'no shifts' }]);
  const reasons = explainInfeasible(roster);
  if (reasons.length > 0) throw new HttpError(422, 'unprocessable', reasons.join(' '), reasons.map((message) => ({ path: 'roster', message })));
  return { roster, version: assembled.version };
}

/**
 * Checks that the roster can be solved as it stands and queues a run for the worker, with the
 * roster it checked. `dryRun` only checks, for callers that must know before they change anything
 * else (server/absences/cover.ts reopens a published roster).
 */
export async function queueRun(workspaceId: number, rosterId: number, parameters: RunRow['parameters'], opts: { dryRun?: boolean } = {}): Promise<RunRow | null> {
  await requireTimeLimitWithinPlan(workspaceId, parameters.timeLimitSeconds);
  const { roster, version } = await prepareRun(workspaceId, rosterId, parameters);
  if (opts.dryRun) return null;
  // A Redis that is down is found before anything is written: 503 with Retry-After, nothing half-started.
  const sequelize = RunRow.sequelize!;
  await requireQueue(sequelize);
  // The row first (the source of truth), its job after the commit. Should the add fail now, the
  // row stays queued and the reconciler (server/queue/reconcile.ts) adds the job once Redis answers.
  const run = await createRunWithinAllowance(workspaceId, { workspaceId, rosterId, parameters, rosterVersion: version, status: 'queued', cancelRequested: false }, roster);
  await enqueueRun(sequelize, run).catch(() => {});
  return run;
}
