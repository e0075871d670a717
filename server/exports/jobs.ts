import type { Request, Response } from 'express';
import { UnrecoverableError, type Job } from 'bullmq';
import { Op, QueryTypes, type Sequelize } from 'sequelize';
import { HttpError } from '../http/errors';
import { activeRunCap } from '../billing/limits';
import { EXPORT_ATTEMPTS, enqueueExport, exportJobId, exportWorkers, queues, requireExportWorker, type ExportJobData } from '../queue/queues';
import { ExportFile, type ExportKind } from './models';
import { EXPORT_JOB_FROM, exportSize, makeExport, type ExportOutput, type ExportParams } from './files';

/** How long a prepared file can be fetched; the worker's reconciler deletes the row after that. */
export const EXPORT_KEEP_MS = 60 * 60_000;
/** Exports one workspace may have waiting or being made at once; more is a 429, so one workspace cannot fill the queue. */
export const MAX_WAITING_EXPORTS = 10;

const statusUrl = (id: number) => `/api/exports/${id}`;

/** The export as `GET /api/exports/:id` and a 202 give it (never the bytes). */
export function exportView(row: ExportFile) {
  return {
    id: row.id,
    kind: row.kind,
    status: row.status,
    filename: row.filename,
    bytes: row.bytes,
    error: row.error,
    createdAt: row.createdAt,
    finishedAt: row.finishedAt,
    expiresAt: row.expiresAt,
    statusUrl: statusUrl(row.id),
    fileUrl: `${statusUrl(row.id)}/file`,
  };
}

/** The file as the sync path has always sent it; the job path sends the stored copy through here too, so the bytes and headers match. */
export function sendFile(res: Response, file: { filename: string; contentType: string; body: Buffer }): void {
  res.setHeader('Content-Type', file.contentType);
  res.setHeader('Content-Disposition', `attachment; filename="${file.filename}"`);
  res.send(file.body);
}

/**
 * An export route's answer. A small file is made here and sent at once, as always; a large one
 * (EXPORT_JOB_FROM, or any size when the client sends `Prefer: respond-async`, RFC 7240 §4.1)
 * becomes a job for a worker: 202 Accepted with the export's address in `Location` (RFC 9110
 * §15.3.3), which the client reads until the file is ready. Bad ids are refused here on both paths.
 */
export async function answerExport(req: Request, res: Response, params: ExportParams): Promise<void> {
  const workspaceId = req.auth!.workspaceId;
  const wantsAsync = /\brespond-async\b/i.test(req.get('prefer') ?? '');
  const size = await exportSize(workspaceId, params);
  if (!wantsAsync && size < EXPORT_JOB_FROM[params.kind].size) return sendFile(res, await makeExport(workspaceId, params));
  const row = await startExport(ExportFile.sequelize!, workspaceId, params);
  res.status(202).set({ Location: statusUrl(row.id), 'Retry-After': '1', ...(wantsAsync ? { 'Preference-Applied': 'respond-async' } : {}) });
  res.json({ export: exportView(row), location: statusUrl(row.id), size: { value: size, unit: EXPORT_JOB_FROM[params.kind].unit } });
}

const keyOf = (params: ExportParams) => JSON.stringify(params);

/**
 * Writes the export's row, then adds its job (as runs do: MariaDB first, the job after the
 * commit; a job lost on the way is added by the reconciler). The same file asked for again while
 * it is still being made is the same export, so a double click costs one job.
 */
export async function startExport(sequelize: Sequelize, workspaceId: number, params: ExportParams): Promise<ExportFile> {
  await requireExportWorker(sequelize);
  const key = keyOf(params);
  const same = await ExportFile.findOne({ where: { workspaceId, kind: params.kind, params: key, status: { [Op.in]: ['queued', 'running'] } }, order: [['id', 'DESC']] });
  if (same) return same;
  const waiting = await ExportFile.count({ where: { workspaceId, status: { [Op.in]: ['queued', 'running'] } } });
  if (waiting >= MAX_WAITING_EXPORTS) {
    throw new HttpError(429, 'rate_limited', `This workspace already has ${waiting} files being prepared. Download those first, or try again in a minute.`, [{ path: 'query', message: 'too many exports waiting' }], { 'Retry-After': '30' });
  }
  const row = await ExportFile.create({ workspaceId, kind: params.kind, params: key, expiresAt: new Date(Date.now() + EXPORT_KEEP_MS) });
  // Redis went away since the check: the row stays queued and the reconciler adds its job when Redis is back.
  await enqueueExport(sequelize, row).catch(() => {});
  return row;
}

/** An export of this workspace; another workspace's id, or one deleted after it expired, is a 404. */
async function findExport(workspaceId: number, id: number, withBody = false): Promise<ExportFile> {
  const row = await (withBody ? ExportFile.scope('withBody') : ExportFile).findOne({ where: { id, workspaceId } });
  if (!row) throw new HttpError(404, 'not_found', 'Export not found: prepared files are kept for an hour, then ask for the file again.', [{ path: 'params.id', message: 'unknown or expired export' }]);
  return row;
}

const NO_WORKER_WORDS = 'No worker was left to prepare this file (the worker processes stopped), so it was not made. Ask for the file again in a minute.';

/**
 * `GET /api/exports/:id`. A file still waiting when no worker serves the queue any more would wait
 * for nobody: it is marked failed, in words, and its job taken back (as compute requests are).
 */
export async function exportStatus(workspaceId: number, id: number): Promise<ReturnType<typeof exportView>> {
  const row = await findExport(workspaceId, id);
  const sequelize = ExportFile.sequelize!;
  if (row.status === 'queued' && (await exportWorkers(sequelize)) === 0) {
    const job = await queues(sequelize).exports.getJob(exportJobId(row.id)).catch(() => null);
    if (!job || (await job.getState().catch(() => 'unknown')) !== 'active') {
      await job?.remove().catch(() => {});
      await ExportFile.update({ status: 'failed', error: NO_WORKER_WORDS, errorStatus: 503, finishedAt: new Date() }, { where: { id: row.id, status: 'queued' } });
      return exportView(await findExport(workspaceId, id));
    }
  }
  return exportView(row);
}

/** `GET /api/exports/:id/file`: the bytes once made (the same headers as the sync answer); 409 while waiting, 422 in words when it failed. */
export async function sendExportFile(res: Response, workspaceId: number, id: number): Promise<void> {
  const row = await findExport(workspaceId, id, true);
  if (row.status === 'failed') throw new HttpError(422, 'unprocessable', `The file could not be prepared: ${row.error ?? 'no reason was recorded'}`, [{ path: 'params.id', message: 'export failed' }]);
  if (row.status !== 'done' || !row.body) {
    throw new HttpError(409, 'conflict', 'This file is still being prepared; read its status (GET /api/exports/:id) until it says done.', [{ path: 'params.id', message: `export is ${row.status}` }], { 'Retry-After': '1' });
  }
  sendFile(res, { filename: row.filename ?? 'export', contentType: row.contentType ?? 'application/octet-stream', body: row.body });
}

/** The reason BullMQ gives, in words a coordinator can read. */
export function exportFailureInWords(reason: string | undefined): string {
  if (/stalled/i.test(reason ?? '')) return 'The file was given up: the worker preparing it stopped twice before it finished. Ask for it again; if it happens again, tell whoever runs Rotaloom.';
  return `Preparing the file failed twice: ${reason || 'no reason was recorded'}. Ask for it again in a minute.`;
}

export async function markExportGivenUp(exportId: number, reason: string | undefined): Promise<boolean> {
  const [count] = await ExportFile.update({ status: 'failed', error: exportFailureInWords(reason), finishedAt: new Date() }, { where: { id: exportId, status: { [Op.in]: ['queued', 'running'] } } });
  return count > 0;
}

/**
 * Marks an export running if its workspace is under its cap of jobs at once (the plan's cap of
 * runs solved at once, server/billing/limits.ts), counted and marked under a MariaDB named lock
 * per workspace, as server/runs/admission.ts does for runs.
 */
async function admitExport(sequelize: Sequelize, row: ExportFile, workerName: string): Promise<boolean> {
  const cap = await activeRunCap(row.workspaceId);
  const name = `rotaloom.exports.${row.workspaceId}`;
  const t = await sequelize.transaction();
  try {
    const [got] = await sequelize.query<{ got: number | null }>('SELECT GET_LOCK(?, 10) AS got', { replacements: [name], type: QueryTypes.SELECT, transaction: t });
    if (got?.got !== 1) return false;
    try {
      const active = await ExportFile.count({ where: { workspaceId: row.workspaceId, status: 'running', id: { [Op.ne]: row.id } } });
      if (active >= cap) return false;
      const [changed] = await ExportFile.update({ status: 'running', claimedBy: workerName.slice(0, 80), startedAt: row.startedAt ?? new Date() }, { where: { id: row.id, status: { [Op.in]: ['queued', 'running'] } } });
      return changed === 1;
    } finally {
      await sequelize.query('SELECT RELEASE_LOCK(?)', { replacements: [name], type: QueryTypes.SELECT, transaction: t });
    }
  } finally {
    await t.commit();
  }
}

/**
 * One export job, in a worker process. The file's own errors (the run was deleted meanwhile, a
 * roster that is not published) end it failed with their words; a crash is thrown, so BullMQ
 * tries once more, and the second failure says so in words. 'deferred': over the workspace's cap.
 */
export async function workExport(sequelize: Sequelize, job: Job<ExportJobData>, workerName: string): Promise<string | 'deferred'> {
  const row = await ExportFile.findByPk(job.data.exportId);
  if (!row) return 'the export no longer exists (it expired, or its workspace was deleted)';
  if (row.status === 'done' || row.status === 'failed') return `the export is already ${row.status}`;
  if (!(await admitExport(sequelize, row, workerName))) return 'deferred';
  const started = Date.now();
  let file: ExportOutput;
  try {
    file = await makeExport(row.workspaceId, JSON.parse(row.params) as ExportParams);
  } catch (err) {
    if (err instanceof HttpError) {
      await ExportFile.update({ status: 'failed', error: err.message, errorStatus: err.status, finishedAt: new Date(), timeMs: Date.now() - started }, { where: { id: row.id } });
      return `failed: ${err.message}`;
    }
    const reason = err instanceof Error ? err.message : String(err);
    if (job.attemptsMade + 1 >= (job.opts.attempts ?? EXPORT_ATTEMPTS)) {
      await ExportFile.update({ status: 'failed', error: exportFailureInWords(reason), finishedAt: new Date(), timeMs: Date.now() - started }, { where: { id: row.id } });
      throw new UnrecoverableError(reason);
    }
    await ExportFile.update({ status: 'queued', claimedBy: null }, { where: { id: row.id, status: 'running' } });
    throw err;
  }
  const finishedAt = new Date();
  await ExportFile.update(
    { status: 'done', filename: file.filename, contentType: file.contentType, body: file.body, bytes: file.body.length, finishedAt, timeMs: finishedAt.getTime() - started, expiresAt: new Date(finishedAt.getTime() + EXPORT_KEEP_MS), error: null },
    { where: { id: row.id } },
  );
  return 'done';
}

export interface ExportReconcileReport {
  enqueued: number[];
  failed: number[];
  expired: number;
}

/**
 * As reconcileRuns: waiting rows without a job get one, rows whose job failed for good are marked
 * failed in words, and files past their hour are deleted.
 */
export async function reconcileExports(sequelize: Sequelize): Promise<ExportReconcileReport> {
  const hub = queues(sequelize);
  const expired = await ExportFile.destroy({ where: { expiresAt: { [Op.lt]: new Date() } } });
  const rows = await ExportFile.findAll({ where: { status: { [Op.in]: ['queued', 'running'] } }, attributes: ['id', 'workspaceId'], order: [['id', 'ASC']], limit: 5000 });
  const report: ExportReconcileReport = { enqueued: [], failed: [], expired };
  for (const row of rows) {
    const state = await hub.exports.getJobState(exportJobId(row.id));
    if (state === 'unknown') {
      await enqueueExport(sequelize, row);
      report.enqueued.push(row.id);
    } else if (state === 'failed') {
      const job = await hub.exports.getJob(exportJobId(row.id));
      if (await markExportGivenUp(row.id, job?.failedReason)) report.failed.push(row.id);
    }
  }
  return report;
}

export type { ExportKind };
