import { Worker as Thread } from 'node:worker_threads';
import { randomUUID } from 'node:crypto';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { DelayedError, UnrecoverableError, Worker, type Job } from 'bullmq';
import type { Sequelize } from 'sequelize';
import { parseRosterId } from '../rosters/ids';
import { Roster, RunRow, AssignmentRow, PinRow } from '../rosters/models';
import { HttpError } from '../http/errors';
import { finite, type RunOutcome, type RunProgress } from './execute';
import { summariseOutcome } from './summary';
import { saveContest, type RunContest } from './seat-contention';
import { previousStart } from './previous-start';
import { coverPinnedSeats } from '../absences/cover-pins';
import { loadRunRoster, previousDual, saveRunDual } from './repository';
import type { DualStart } from '../../solver/roster/lagrangian';
import { prepareRun } from './start';
import { admitRun } from './admission';
import { priceConcession } from './concession-price';
import { seatAlternatives } from './alternatives';
import { COMPUTE_QUEUE, EXPORTS_QUEUE, RUN_ATTEMPTS, RUNS_QUEUE, queueSettings, quietErrors, useRedis, type ComputeJobData, type ComputeJobResult, type ExportJobData, type RunJobData } from '../queue/queues';
import { markExportGivenUp, reconcileExports, workExport } from '../exports/jobs';
import { workerOptions } from '../queue/connection';
import { failureInWords, markGivenUp, reconcileRuns } from '../queue/reconcile';
import type { RosterAssignment } from '../../shared/roster/schema';

export interface RunWorkerOptions {
  /** Names this worker in `runs.claimed_by`. */
  name?: string;
  log?: (line: string) => void;
  /** The Redis of the queue (default: the process environment's, server/env.ts). */
  redisUrl?: string;
  /** Runs solved at once by this worker (each takes a thread, about a core). */
  concurrency?: number;
  /**
   * How long a job's lock lasts between renewals. A worker killed mid-run stops renewing; BullMQ's
   * stall check (every lockMs / 2) then hands its job to another worker, so a lost run waits
   * about lockMs to 2 × lockMs, not the 90 s a heartbeat sweep took.
   */
  lockMs?: number;
  /** How often the reconciler compares the run rows with the queue (server/queue/reconcile.ts). */
  reconcileMs?: number;
  /** A run turned away by its workspace's cap is offered again after this long. */
  capDelayMs?: number;
}

/**
 * The BullMQ worker settings of every solve worker; exported so tests can stand in for a worker
 * that dies (takes a job and stops renewing its lock) with exactly these.
 */
export function queueWorkerOptions(o: { url: string; prefix: string; lockMs: number; name: string; concurrency?: number; autorun?: boolean }) {
  return {
    connection: workerOptions(o.url),
    prefix: o.prefix,
    concurrency: o.concurrency ?? 1,
    autorun: o.autorun ?? true,
    lockDuration: o.lockMs,
    stalledInterval: Math.max(500, Math.round(o.lockMs / 2)),
    // A job found stalled once is retried on another worker; found stalled again, it fails (the reconciler words it).
    maxStalledCount: 1,
    name: o.name,
  };
}

type RunEnd = { worked: boolean; ended: string };

/** Thrown out of a run when this worker is stopping: the job goes back to the queue without costing an attempt. */
class HandedBack extends Error {}

/**
 * A BullMQ worker of solve jobs (server/queue). MariaDB is the source of truth: a job carries only
 * the run's id, and progress, heartbeat and results go to the run's row. Each run is solved in a
 * worker thread; pricing concessions and seat alternatives come in on a second queue, so the API
 * processes never run the solver. Any number of these run in any number of processes.
 */
export class RunWorker {
  readonly name: string;
  private readonly log: (line: string) => void;
  private readonly url: string;
  private readonly prefix: string;
  private readonly concurrency: number;
  private readonly lockMs: number;
  private readonly reconcileMs: number;
  private readonly capDelayMs: number;
  private runs: Worker<RunJobData> | null = null;
  private compute: Worker<ComputeJobData, ComputeJobResult> | null = null;
  private exports: Worker<ExportJobData> | null = null;
  private manual: Worker<RunJobData> | null = null;
  private reconcileTimer: ReturnType<typeof setInterval> | null = null;
  private reconciling = false;
  private stopping = false;
  private readonly threads = new Set<Thread>();

  constructor(
    private readonly sequelize: Sequelize,
    options: RunWorkerOptions = {},
  ) {
    this.name = options.name ?? `${os.hostname()}:${process.pid}:${Math.random().toString(36).slice(2, 8)}`;
    this.log = options.log ?? (() => {});
    if (options.redisUrl) useRedis(sequelize, options.redisUrl);
    const settings = queueSettings(sequelize);
    this.url = settings.url;
    this.prefix = settings.prefix;
    this.concurrency = options.concurrency ?? 1;
    this.lockMs = options.lockMs ?? 10_000;
    this.reconcileMs = options.reconcileMs ?? 10_000;
    this.capDelayMs = options.capDelayMs ?? 1000;
  }

  private workerOpts(concurrency: number, autorun = true) {
    return queueWorkerOptions({ url: this.url, prefix: this.prefix, lockMs: this.lockMs, name: this.name, concurrency, autorun });
  }

  /** Works both queues continuously and reconciles the run rows with the queue now and every reconcileMs. */
  start(): void {
    this.stopping = false;
    if (!this.runs) {
      this.runs = new Worker<RunJobData>(RUNS_QUEUE, (job, token) => this.processJob(job, token), this.workerOpts(this.concurrency));
      this.runs.on('error', quietErrors('run worker'));
      // A job failed for good without its processor running (stalled too often): the row says so now, not at the next reconcile.
      this.runs.on('failed', (job) => {
        if (job?.deferredFailure) void markGivenUp(job.data.runId, job.failedReason).catch(() => {});
      });
    }
    this.startCompute();
    if (!this.reconcileTimer) {
      this.reconcileTimer = setInterval(() => void this.reconcile(), this.reconcileMs);
      void this.reconcile();
    }
  }

  /** Only the compute queues (prices, alternatives, large exports): for tests that solve runs one tick at a time. */
  startCompute(): void {
    if (!this.compute) {
      this.compute = new Worker<ComputeJobData, ComputeJobResult>(COMPUTE_QUEUE, (job) => this.processCompute(job), this.workerOpts(1));
      this.compute.on('error', quietErrors('compute worker'));
    }
    if (!this.exports) {
      // A queue of its own, so a person waiting on a price is not held up behind a year's PDF.
      this.exports = new Worker<ExportJobData>(EXPORTS_QUEUE, (job, token) => this.processExport(job, token), this.workerOpts(1));
      this.exports.on('error', quietErrors('export worker'));
      this.exports.on('failed', (job) => {
        if (job?.deferredFailure) void markExportGivenUp(job.data.exportId, job.failedReason).catch(() => {});
      });
    }
  }

  /** Resolves once this worker's queues are connected, so other processes count it (Queue.getWorkersCount). */
  async ready(): Promise<void> {
    await Promise.all([this.runs?.waitUntilReady(), this.compute?.waitUntilReady(), this.exports?.waitUntilReady()]);
  }

  /** Runs the reconciler once (never two at once in this process); a Redis that is down is tried again next time. */
  async reconcile(): Promise<void> {
    if (this.reconciling) return;
    this.reconciling = true;
    try {
      const report = await reconcileRuns(this.sequelize);
      if (report.enqueued.length) this.log(`reconciler: enqueued runs ${report.enqueued.join(', ')} that had no job`);
      if (report.failed.length) this.log(`reconciler: marked runs ${report.failed.join(', ')} failed`);
      const files = await reconcileExports(this.sequelize);
      if (files.enqueued.length) this.log(`reconciler: enqueued exports ${files.enqueued.join(', ')} that had no job`);
      if (files.failed.length) this.log(`reconciler: marked exports ${files.failed.join(', ')} failed`);
    } catch (err) {
      this.log(`reconciler: ${err instanceof Error ? err.message : String(err)}`);
    } finally {
      this.reconciling = false;
    }
  }

  /**
   * Takes the next run job, if any, and works it to the end in this call; jobs that need no work
   * (their run finished or was deleted meanwhile) are passed over. Returns the id of the run
   * solved, or null when the queue has none. For tests and tools that want one step at a time.
   */
  async tick(): Promise<number | null> {
    this.manual ??= new Worker<RunJobData>(RUNS_QUEUE, undefined, this.workerOpts(1, false));
    for (let passes = 0; passes < 100; passes++) {
      const token = randomUUID();
      const job = (await this.manual.getNextJob(token, { block: false })) as Job<RunJobData> | undefined;
      if (!job) return null;
      // A job stalled more often than allowed comes back marked to fail (BullMQ's run loop does the same).
      if (job.deferredFailure) {
        await job.moveToFailed(new UnrecoverableError(job.deferredFailure), token, false);
        continue;
      }
      const renew = setInterval(() => void job.extendLock(token, this.lockMs).catch(() => {}), Math.round(this.lockMs / 3));
      try {
        const end = await this.processRun(job);
        if (end === 'deferred') {
          await job.moveToDelayed(Date.now() + this.capDelayMs, token);
          continue;
        }
        await job.moveToCompleted(end, token, false);
        if (end.worked) return job.data.runId;
      } catch (err) {
        if (err instanceof HandedBack) {
          await job.moveToDelayed(Date.now(), token);
          return null;
        }
        await job.moveToFailed(err instanceof Error ? err : new Error(String(err)), token, false);
        return job.data.runId;
      } finally {
        clearInterval(renew);
      }
    }
    return null;
  }

  /** Stops taking jobs; a run in progress goes back to the queue (another worker, or the next start, solves it). */
  async stop(): Promise<void> {
    this.stopping = true;
    if (this.reconcileTimer) clearInterval(this.reconcileTimer);
    this.reconcileTimer = null;
    await Promise.all([...this.threads].map((t) => t.terminate()));
    await Promise.allSettled([this.runs?.close(), this.compute?.close(), this.exports?.close(), this.manual?.close()]);
    this.runs = this.compute = this.manual = this.exports = null;
  }

  /** The BullMQ processor: a run over its workspace's cap waits (delayed, keeping its priority) and is offered again. */
  private async processJob(job: Job<RunJobData>, token?: string): Promise<RunEnd> {
    try {
      const end = await this.processRun(job);
      if (end !== 'deferred') return end;
      await job.moveToDelayed(Date.now() + this.capDelayMs, token);
    } catch (err) {
      if (!(err instanceof HandedBack)) throw err;
      await job.moveToDelayed(Date.now(), token);
    }
    throw new DelayedError();
  }

  /** An export job (server/exports/jobs.ts); one over its workspace's cap waits, keeping its priority, and is offered again. */
  private async processExport(job: Job<ExportJobData>, token?: string): Promise<string> {
    const end = await workExport(this.sequelize, job, this.name);
    if (end !== 'deferred') return end;
    await job.moveToDelayed(Date.now() + this.capDelayMs, token);
    throw new DelayedError();
  }

  private async processCompute(job: Job<ComputeJobData, ComputeJobResult>): Promise<ComputeJobResult> {
    const d = job.data;
    try {
      const value = d.kind === 'price' ? await priceConcession(d.workspaceId, d.runId, d.index, d.params) : await seatAlternatives(d.workspaceId, d.runId, d.seatId);
      return { ok: true, value };
    } catch (err) {
      // An answer in words for the person waiting (404, 409, …) travels back as data, not as a failed job.
      if (err instanceof HttpError) return { ok: false, status: err.status, code: err.code, message: err.message, ...(err.fields ? { fields: err.fields } : {}) };
      throw err;
    }
  }

  /**
   * One run job. A run whose row is gone (its roster was deleted) or already finished ends at once:
   * that is also what makes a duplicate job harmless. Errors of the roster itself end the run as
   * failed in words; a crash of the solver is thrown, so BullMQ tries once more, and the second
   * failure marks the run failed.
   */
  private async processRun(job: Job<RunJobData>): Promise<RunEnd | 'deferred'> {
    const id = job.data.runId;
    const run = await RunRow.findByPk(id);
    if (!run) return { worked: false, ended: 'the run no longer exists (its roster was deleted)' };
    if (run.status !== 'queued' && run.status !== 'running') return { worked: false, ended: `the run is already ${run.status}` };
    if (run.cancelRequested) {
      await this.finish(id, { status: 'cancelled', error: 'Cancelled before it started' });
      return { worked: false, ended: 'cancelled before it started' };
    }
    if (!(await admitRun(this.sequelize, run, this.name))) return 'deferred';
    const started = Date.now();
    const lastAttempt = job.attemptsMade + 1 >= (job.opts.attempts ?? RUN_ATTEMPTS);
    try {
      // The roster assembled and checked when the run was started (server/runs/start.ts); a run
      // written before rosters were kept with their runs gets the same preparation now.
      const roster = (await loadRunRoster(id)) ?? (await prepareRun(run.workspaceId, run.rosterId, run.parameters)).roster;
      const start = await previousStart(run.workspaceId, run.rosterId, id, roster);
      const dualStart = await previousDual(run.workspaceId, run.rosterId, id);
      const result = await this.runThread(id, job, roster, run.parameters, start, dualStart);
      if (this.stopping) throw new HandedBack();
      if (result.type === 'failed') {
        await this.finish(id, { status: 'failed', error: result.reasons.join('\n') });
        return { worked: true, ended: 'failed: infeasible' };
      }
      if (result.type === 'error') throw new Error(`the solver stopped with an error: ${result.message}`);
      const saved = await this.save(run, result.outcome, result.contest, started);
      return { worked: true, ended: saved };
    } catch (err) {
      if (err instanceof HandedBack) {
        await RunRow.update({ status: 'queued', claimedBy: null }, { where: { id, status: 'running' } });
        throw err;
      }
      if (err instanceof HttpError && err.status === 404) return { worked: false, ended: 'the roster was deleted' };
      if (err instanceof HttpError && err.status === 422) {
        await this.finish(id, { status: 'failed', error: err.message });
        return { worked: true, ended: 'failed: roster problems' };
      }
      if (!(await RunRow.findByPk(id, { attributes: ['id'] }))) return { worked: false, ended: 'the run was deleted while it ran (its roster was deleted)' };
      const reason = err instanceof Error ? err.message : String(err);
      if (lastAttempt) await this.finish(id, { status: 'failed', error: failureInWords(reason) });
      else await RunRow.update({ status: 'queued', claimedBy: null, error: `The first attempt failed (${reason}); trying once more.` }, { where: { id, status: 'running' } });
      throw err;
    }
  }

  private async save(run: RunRow, outcome: RunOutcome, contest: RunContest | null, started: number): Promise<string> {
    const id = run.id;
    const cancelled = (await RunRow.findByPk(id, { attributes: ['cancelRequested'] }))?.cancelRequested ?? false;
    const pins = new Set([...(await PinRow.findAll({ where: { rosterId: run.rosterId, workspaceId: run.workspaceId } })).map((p) => p.seatId), ...coverPinnedSeats(run.parameters)]);
    await this.sequelize.transaction(async (transaction) => {
      await AssignmentRow.destroy({ where: { runId: id }, transaction });
      await AssignmentRow.bulkCreate(
        Object.entries(outcome.assignment).map(([seat, person]) => {
          const seatId = parseRosterId('st', seat);
          return { workspaceId: run.workspaceId, runId: id, seatId, personId: person ? parseRosterId('p', person) : null, pinned: pins.has(seatId) };
        }),
        { transaction },
      );
      await RunRow.update(
        {
          status: cancelled ? 'cancelled' : 'done',
          score: finite(outcome.score),
          bound: finite(outcome.bound),
          gap: finite(outcome.gap),
          timeMs: Date.now() - started,
          finishedAt: new Date(),
          result: summariseOutcome(outcome),
          error: cancelled ? 'Cancelled; this is the best roster found until then' : null,
        },
        { where: { id }, transaction },
      );
      await Roster.update({ status: 'solved' }, { where: { id: run.rosterId, status: 'draft', version: run.rosterVersion }, transaction });
      await saveContest(this.sequelize, id, contest, transaction);
      await saveRunDual(id, outcome.dual ?? null, transaction);
    });
    return cancelled ? 'cancelled with the best roster so far' : 'done';
  }

  private async finish(id: number, fields: { status: 'failed' | 'cancelled'; error: string }): Promise<void> {
    await RunRow.update({ ...fields, finishedAt: new Date() }, { where: { id } });
  }

  private runThread(
    id: number,
    job: Job<RunJobData>,
    roster: unknown,
    params: { timeLimitSeconds: number; seed: number },
    start: RosterAssignment | undefined,
    dualStart: DualStart | undefined,
  ): Promise<{ type: 'done'; outcome: RunOutcome; contest: RunContest | null } | { type: 'failed'; reasons: string[] } | { type: 'error'; message: string }> {
    // After the solve, the thread computes how contested each seat is (sum-product marginals) for
    // up to marginalsMs; past that plus a margin for building its engine the thread is ended and the
    // run keeps no marginals (60 people × 13 weeks: one loopy pass takes over 30 s, measured).
    const marginalsMs = Math.round(Math.min(3000, Math.max(1000, params.timeLimitSeconds * 300)));
    let solved: RunOutcome | null = null;
    let contestTimer: ReturnType<typeof setTimeout> | undefined;
    return new Promise((resolve) => {
      const thread = new Thread(path.join(path.dirname(fileURLToPath(import.meta.url)), 'solve-thread-entry.mjs'), { workerData: { roster, params: { ...params, marginalsMs }, start, dualStart } });
      this.threads.add(thread);
      let lastWrite = 0;
      let settled = false;
      const settle = (value: Parameters<typeof resolve>[0]) => {
        if (settled) return;
        settled = true;
        clearTimeout(contestTimer);
        this.threads.delete(thread);
        void thread.terminate();
        resolve(value);
      };
      thread.on('message', (msg: { type: string; progress?: RunProgress } & Record<string, unknown>) => {
        if (msg.type === 'progress' && msg.progress) {
          const now = Date.now();
          if (now - lastWrite < 400) return;
          lastWrite = now;
          const p = msg.progress;
          const progress = { ...p, score: finite(p.score) ?? 0, bound: finite(p.bound) ?? 0, gap: finite(p.gap) ?? 0 };
          // The row is what the client polls; the job's progress feeds BullMQ's queue events.
          void job.updateProgress(progress).catch(() => {});
          // Cancelling is a flag on the row (any API process sets it); seen here within about 0.4 s.
          void RunRow.update({ progress, score: finite(p.score), bound: finite(p.bound), gap: finite(p.gap), heartbeatAt: new Date() }, { where: { id } })
            .then(() => RunRow.findByPk(id, { attributes: ['cancelRequested'] }))
            .then((row) => {
              if (row?.cancelRequested) thread.postMessage('cancel');
            })
            .catch(() => {});
          return;
        }
        if (msg.type === 'done') {
          solved = msg.outcome as RunOutcome;
          contestTimer = setTimeout(() => settle({ type: 'done', outcome: solved!, contest: null }), marginalsMs + 5000);
          return;
        }
        // After a solve, whatever comes next (marginals, or an error computing them) ends the wait.
        if (solved) return settle({ type: 'done', outcome: solved, contest: msg.type === 'contest' ? (msg.contest as RunContest) : null });
        settle(msg as never);
      });
      thread.on('error', (err) => settle(solved ? { type: 'done', outcome: solved, contest: null } : { type: 'error', message: err.message }));
      thread.on('exit', (code) => settle(solved ? { type: 'done', outcome: solved, contest: null } : { type: 'error', message: `the solver thread exited (${code})` }));
    });
  }
}
