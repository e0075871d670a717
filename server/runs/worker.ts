import { Worker } from 'node:worker_threads';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { QueryTypes, type Sequelize } from 'sequelize';
import { assembleRoster } from '../rosters/assemble';
import { parseRosterId } from '../rosters/ids';
import { Roster, RunRow, AssignmentRow, PinRow } from '../rosters/models';
import { finite, type RunOutcome, type RunProgress } from './execute';
import { summariseOutcome } from './summary';
import { saveContest, type RunContest } from './contest';
import { previousStart } from './previous-start';
import { coverPinnedSeats, withCoverPins } from '../absences/cover-pins';
import type { RosterAssignment } from '../../shared/roster/schema';

export interface RunWorkerOptions {
  /** Names this worker in `runs.claimed_by`. */
  name?: string;
  pollMs?: number;
  /** A running run whose heartbeat is older than this belonged to a process that died: it is claimed again. */
  staleMs?: number;
  log?: (line: string) => void;
}

/**
 * Claims queued runs from MariaDB one at a time (`SELECT … FOR UPDATE SKIP LOCKED`, so any
 * number of workers in any number of processes never take the same run) and solves each in a
 * worker thread, writing progress, heartbeat and the result back to the run's row.
 */
export class RunWorker {
  private timer: ReturnType<typeof setInterval> | null = null;
  private busy = false;
  private thread: Worker | null = null;
  private currentRunId: number | null = null;
  readonly name: string;
  private readonly pollMs: number;
  private readonly staleMs: number;
  private readonly log: (line: string) => void;

  constructor(
    private readonly sequelize: Sequelize,
    options: RunWorkerOptions = {},
  ) {
    this.name = options.name ?? `${os.hostname()}:${process.pid}:${Math.random().toString(36).slice(2, 8)}`;
    this.pollMs = options.pollMs ?? 500;
    this.staleMs = options.staleMs ?? 30_000;
    this.log = options.log ?? (() => {});
  }

  start(): void {
    if (this.timer) return;
    this.timer = setInterval(() => void this.tick(), this.pollMs);
    void this.tick();
  }

  async stop(): Promise<void> {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    if (this.thread) await this.thread.terminate();
    // Handing the run back lets the next worker (or the next start) finish it.
    if (this.currentRunId !== null) await RunRow.update({ status: 'queued', claimedBy: null }, { where: { id: this.currentRunId, status: 'running' } });
  }

  /** One poll: requeue abandoned runs, then claim and solve at most one. Returns the run id it solved. */
  async tick(): Promise<number | null> {
    if (this.busy) return null;
    this.busy = true;
    try {
      await this.requeueStale();
      const id = await this.claim();
      if (id === null) return null;
      await this.solve(id);
      return id;
    } catch (err) {
      this.log(`run worker: ${err instanceof Error ? err.message : String(err)}`);
      return null;
    } finally {
      this.busy = false;
    }
  }

  private async requeueStale(): Promise<void> {
    const cutoff = new Date(Date.now() - this.staleMs);
    await this.sequelize.query(
      "UPDATE runs SET status = 'queued', claimed_by = NULL, updated_at = NOW() WHERE status = 'running' AND (heartbeat_at IS NULL OR heartbeat_at < ?)",
      { replacements: [cutoff] },
    );
  }

  private async claim(): Promise<number | null> {
    return this.sequelize.transaction(async (transaction) => {
      const rows = await this.sequelize.query<{ id: number }>("SELECT id FROM runs WHERE status = 'queued' ORDER BY id LIMIT 1 FOR UPDATE SKIP LOCKED", {
        type: QueryTypes.SELECT,
        transaction,
      });
      if (rows.length === 0) return null;
      const id = rows[0].id;
      const now = new Date();
      await RunRow.update({ status: 'running', claimedBy: this.name, startedAt: now, heartbeatAt: now }, { where: { id }, transaction });
      return id;
    });
  }

  private async solve(id: number): Promise<void> {
    const run = (await RunRow.findByPk(id))!;
    this.currentRunId = id;
    const started = Date.now();
    try {
      if (run.cancelRequested) return void (await this.finish(id, { status: 'cancelled', error: 'Cancelled before it started' }));
      const { parsed } = await assembleRoster(run.workspaceId, run.rosterId);
      if (!parsed.ok) {
        const text = parsed.issues.slice(0, 10).map((i) => `${i.path}: ${i.message}`).join('\n');
        return void (await this.finish(id, { status: 'failed', error: `The roster has problems to fix first:\n${text}` }));
      }
      // A cover run (server/absences/cover.ts) keeps the seats its parameters pin.
      const roster = withCoverPins(parsed.roster, run.parameters);
      const start = await previousStart(run.workspaceId, run.rosterId, id, roster);
      const result = await this.runThread(id, roster, run.parameters, start);
      if (result.type === 'failed') return void (await this.finish(id, { status: 'failed', error: result.reasons.join('\n') }));
      if (result.type === 'error') return void (await this.finish(id, { status: 'failed', error: `The solver stopped with an error: ${result.message}` }));
      const outcome = result.outcome;
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
        await saveContest(this.sequelize, id, result.contest, transaction);
      });
    } catch (err) {
      await this.finish(id, { status: 'failed', error: `The run failed: ${err instanceof Error ? err.message : String(err)}` });
    } finally {
      this.currentRunId = null;
    }
  }

  private async finish(id: number, fields: { status: 'failed' | 'cancelled'; error: string }): Promise<void> {
    await RunRow.update({ ...fields, finishedAt: new Date() }, { where: { id } });
  }

  private runThread(
    id: number,
    roster: unknown,
    params: { timeLimitSeconds: number; seed: number },
    start: RosterAssignment | undefined,
  ): Promise<{ type: 'done'; outcome: RunOutcome; contest: RunContest | null } | { type: 'failed'; reasons: string[] } | { type: 'error'; message: string }> {
    // After the solve, the thread computes how contested each seat is (sum-product marginals) for
    // up to marginalsMs; past that plus a margin for building its engine the thread is ended and the
    // run keeps no marginals (60 people × 13 weeks: one loopy pass takes over 30 s, measured).
    const marginalsMs = Math.round(Math.min(3000, Math.max(1000, params.timeLimitSeconds * 300)));
    let solved: RunOutcome | null = null;
    let contestTimer: ReturnType<typeof setTimeout> | undefined;
    return new Promise((resolve) => {
      const thread = new Worker(path.join(path.dirname(fileURLToPath(import.meta.url)), 'solve-thread-entry.mjs'), { workerData: { roster, params: { ...params, marginalsMs }, start } });
      this.thread = thread;
      let lastWrite = 0;
      let settled = false;
      const settle = (value: Parameters<typeof resolve>[0]) => {
        if (settled) return;
        settled = true;
        clearTimeout(contestTimer);
        this.thread = null;
        void thread.terminate();
        resolve(value);
      };
      thread.on('message', (msg: { type: string; progress?: RunProgress } & Record<string, unknown>) => {
        if (msg.type === 'progress' && msg.progress) {
          const now = Date.now();
          if (now - lastWrite < 400) return;
          lastWrite = now;
          const p = msg.progress;
          void RunRow.update(
            { progress: { ...p, score: finite(p.score) ?? 0, bound: finite(p.bound) ?? 0, gap: finite(p.gap) ?? 0 }, score: finite(p.score), bound: finite(p.bound), gap: finite(p.gap), heartbeatAt: new Date() },
            { where: { id } },
          )
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
