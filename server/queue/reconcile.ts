import { Op, type Sequelize } from 'sequelize';
import { RunRow } from '../rosters/models';
import { enqueueRun, queues, runJobId } from './queues';

/** The reason BullMQ gives, in words a coordinator can read. */
export function failureInWords(reason: string | undefined): string {
  const r = reason ?? '';
  if (/stalled/i.test(r)) return 'The run was given up: the worker solving it stopped twice before it finished (its process ended or lost the queue). Start it again; if it happens again, the roster may be too large for the workers’ memory.';
  return `The run was given up after two attempts: ${r || 'no reason was recorded'}.`;
}

/** Marks a run whose job failed for good as failed, in words, unless it has ended meanwhile. True when it changed the row. */
export async function markGivenUp(runId: number, reason: string | undefined): Promise<boolean> {
  const [count] = await RunRow.update({ status: 'failed', error: failureInWords(reason), finishedAt: new Date() }, { where: { id: runId, status: { [Op.in]: ['queued', 'running'] } } });
  return count > 0;
}

export interface ReconcileReport {
  /** Rows that were queued or running with no job in the queue, now enqueued. */
  enqueued: number[];
  /** Rows whose job had failed for good (e.g. stalled twice), now marked failed. */
  failed: number[];
}

/**
 * MariaDB is the source of truth and Redis may lose jobs or miss adds (it was down when a run was
 * written, or restarted without its data): every queued or running row gets a job when it has
 * none, and a row whose job failed for good is marked failed with the reason in words. Safe to run
 * in every process at once: adds are keyed by the run id.
 */
export async function reconcileRuns(sequelize: Sequelize): Promise<ReconcileReport> {
  const hub = queues(sequelize);
  const rows = await RunRow.findAll({ where: { status: { [Op.in]: ['queued', 'running'] } }, attributes: ['id', 'workspaceId'], order: [['id', 'ASC']], limit: 5000 });
  const report: ReconcileReport = { enqueued: [], failed: [] };
  for (const row of rows) {
    const state = await hub.runs.getJobState(runJobId(row.id));
    if (state === 'unknown') {
      await enqueueRun(sequelize, row);
      report.enqueued.push(row.id);
    } else if (state === 'failed') {
      const job = await hub.runs.getJob(runJobId(row.id));
      if (await markGivenUp(row.id, job?.failedReason)) report.failed.push(row.id);
    }
  }
  return report;
}
