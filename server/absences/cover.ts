import { HttpError } from '../http/errors';
import { AssignmentRow } from '../rosters/models';
import { findRoster } from '../rosters/repository';
import { reopenRoster } from '../rosters/publish';
import { queueRun } from '../runs/start';
import { absenceConflicts, baseRunOf } from './conflicts';
import type { CoverParameters } from './cover-pins';

/**
 * "Find cover": a re-solve that keeps every seat of the roster people are working from (the
 * published run, else the latest solved one) pinned to its holder, except the seats approved
 * absences take away. A published roster is frozen, so it is reopened first (publish.ts), but only
 * once the checks show the run can start, so a refused cover leaves the roster as it was.
 */
export async function startAbsenceCover(workspaceId: number, rosterId: number, params: { timeLimitSeconds: number; seed: number }): Promise<{ runId: number; freedSeatIds: number[] }> {
  const roster = await findRoster(workspaceId, rosterId);
  const conflicts = await absenceConflicts(workspaceId, { rosterId });
  if (conflicts.length === 0) {
    const what = roster.status === 'draft' ? 'This roster has not been solved yet, so no seat is taken by anyone on leave.' : 'No approved absence takes a seat of this roster: nothing needs cover.';
    throw new HttpError(409, 'conflict', what, [{ path: 'params.rosterId', message: 'no absence conflicts' }]);
  }
  const baseRunId = (await baseRunOf(workspaceId, roster))!;
  const freed = new Map(conflicts.map((c) => [c.seatId, c.personId]));
  const held = await AssignmentRow.findAll({ where: { workspaceId, runId: baseRunId }, attributes: ['seatId', 'personId'], raw: true });
  const parameters: RunParametersWithCover = {
    ...params,
    cover: {
      baseRunId,
      pins: held.filter((a) => !freed.has(a.seatId)).map((a) => ({ seatId: a.seatId, personId: a.personId ?? null })),
      freed: [...freed].map(([seatId, personId]) => ({ seatId, personId })),
    },
  };
  // queueRun lays the cover pins in `parameters` over the roster before its checks (server/runs/start.ts).
  if (roster.status === 'published') {
    await queueRun(workspaceId, rosterId, parameters, { dryRun: true });
    await reopenRoster(workspaceId, rosterId, roster.version);
  }
  const run = (await queueRun(workspaceId, rosterId, parameters))!;
  return { runId: run.id, freedSeatIds: [...freed.keys()] };
}

type RunParametersWithCover = { timeLimitSeconds: number; seed: number } & CoverParameters;
