import { Op } from 'sequelize';
import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { HttpError, notFound } from '../http/errors';
import { idParams } from '../../shared/api/paging';
import { rosterIdParams, scoreBody, startRunBody } from '../../shared/api/rosters';
import { explainInfeasible, scoreRoster } from '../../solver/roster';
import { assembleRoster } from '../rosters/assemble';
import { rosterIds, parseRosterId } from '../rosters/ids';
import { AssignmentRow, RunRow } from '../rosters/models';
import { finite } from './execute';
import { requireRunsAllowed } from '../billing/limits';
import { refuseWhenPublished } from '../rosters/publish';
import { findRoster } from '../rosters/repository';
import { cachedRun, FINAL_STATUSES, rememberRun } from './result-cache';
import { runNumber, runNumbers } from './numbering';
import { enqueueRun, queues, requireQueue, runJobId } from '../queue/queues';
import { runEventStream } from './events-stream';
import { createRunWithinAllowance, requireTimeLimitWithinPlan } from './fair-use';

const ws = (req: { auth?: { workspaceId: number } }) => req.auth!.workspaceId;

const toRunDto = (r: RunRow, number: number) => ({
  id: r.id,
  number,
  rosterId: r.rosterId,
  status: r.status,
  parameters: r.parameters,
  progress: r.progress ?? null,
  score: r.score ?? null,
  bound: r.bound ?? null,
  gap: r.gap ?? null,
  rosterVersion: r.rosterVersion,
  cancelRequested: r.cancelRequested,
  startedAt: r.startedAt ?? null,
  finishedAt: r.finishedAt ?? null,
  timeMs: r.timeMs ?? null,
  error: r.error ?? null,
  createdAt: r.createdAt,
});

/** Assembles and validates a roster, answering 422 in words when it cannot be solved as it stands. */
async function solvableRoster(workspaceId: number, rosterId: number) {
  const { parsed, version } = await assembleRoster(workspaceId, rosterId);
  if (!parsed.ok) {
    throw new HttpError(422, 'unprocessable', `The roster has problems to fix first: ${parsed.issues[0].path}: ${parsed.issues[0].message}`, parsed.issues.map((i) => ({ path: `roster.${i.path}`, message: i.message })));
  }
  return { roster: parsed.roster, version };
}

/**
 * Checks that the roster can be solved as it stands and queues a run for the worker. `prepare`
 * changes the assembled roster the checks see (a cover run lays its pins over the roster's, the
 * worker does the same with the run's parameters); `dryRun` only checks, for callers that must
 * know before they change anything else (server/absences/cover.ts reopens a published roster).
 */
export async function queueRun(
  workspaceId: number,
  rosterId: number,
  parameters: RunRow['parameters'],
  opts: { prepare?: (roster: ParsedRoster) => ParsedRoster; dryRun?: boolean } = {},
): Promise<RunRow | null> {
  await requireTimeLimitWithinPlan(workspaceId, parameters.timeLimitSeconds);
  const solvable = await solvableRoster(workspaceId, rosterId);
  const roster = opts.prepare ? opts.prepare(solvable.roster) : solvable.roster;
  if (roster.seats.length === 0) throw new HttpError(422, 'unprocessable', 'This roster has no shifts yet: add a shift pattern or a shift first.', [{ path: 'roster.shifts', message: 'no shifts' }]);
  const reasons = explainInfeasible(roster);
  if (reasons.length > 0) throw new HttpError(422, 'unprocessable', reasons.join(' '), reasons.map((message) => ({ path: 'roster', message })));
  if (opts.dryRun) return null;
  // A Redis that is down is found before anything is written: 503 with Retry-After, nothing half-started.
  const sequelize = RunRow.sequelize!;
  await requireQueue(sequelize);
  // The row first (the source of truth), its job after the commit. Should the add fail now, the
  // row stays queued and the reconciler (server/queue/reconcile.ts) adds the job once Redis answers.
  const run = await createRunWithinAllowance(workspaceId, { workspaceId, rosterId, parameters, rosterVersion: solvable.version, status: 'queued', cancelRequested: false });
  await enqueueRun(sequelize, run).catch(() => {});
  return run;
}
type ParsedRoster = Awaited<ReturnType<typeof solvableRoster>>['roster'];

export function runsRouter() {
  const routes = new ApiRoutes('/rosters');
  routes.post('/:rosterId/runs', COORDINATOR_UP, validate({ params: rosterIdParams, body: startRunBody }), requireRunsAllowed, refuseWhenPublished, async (req, res) => {
    const run = (await queueRun(ws(req), Number(req.params.rosterId), req.body))!;
    res.status(202).json(toRunDto(run, await runNumber(run)));
  });
  routes.get('/:rosterId/runs', COORDINATOR_UP, validate({ params: rosterIdParams }), async (req, res) => {
    await findRoster(ws(req), Number(req.params.rosterId)); // another workspace's roster is a 404, not an empty list
    const rows = await RunRow.findAll({ where: { workspaceId: ws(req), rosterId: Number(req.params.rosterId) }, order: [['id', 'DESC']], limit: 50, attributes: { exclude: ['result'] } });
    const numbers = await runNumbers(ws(req), Number(req.params.rosterId));
    res.json({ items: rows.map((r) => toRunDto(r, numbers.get(r.id) ?? 0)) });
  });
  routes.post('/:rosterId/score', COORDINATOR_UP, validate({ params: rosterIdParams, body: scoreBody }), async (req, res) => {
    const { roster } = await solvableRoster(ws(req), Number(req.params.rosterId));
    const known = new Set(roster.seats.map((s) => s.id));
    const assignment: Record<string, string | null> = {};
    for (const [seat, person] of Object.entries(req.body.assignment as Record<string, number | null>)) {
      const key = rosterIds.seat(Number(seat));
      if (!known.has(key)) throw new HttpError(422, 'unprocessable', `Seat ${seat} is not part of this roster`, [{ path: `body.assignment.${seat}`, message: 'unknown seat' }]);
      assignment[key] = person === null ? null : rosterIds.person(person);
    }
    const check = scoreRoster(roster, assignment);
    res.json({
      total: finite(check.total),
      feasible: check.feasible,
      softTotal: check.softTotal,
      terms: check.terms,
      hardCounts: check.hardCounts,
      violations: check.violations.map((v) => ({ ...v, points: finite(v.points), seats: v.seats.map((s) => parseRosterId('st', s)) })),
    });
  });

  const runs = new ApiRoutes('/runs');
  runs.get('/:id', COORDINATOR_UP, validate({ params: idParams }), async (req, res) => {
    const cached = cachedRun(Number(req.params.id), ws(req));
    if (cached) return void res.type('json').set('ETag', cached.etag).send(cached.json);
    const run = await RunRow.findOne({ where: { id: Number(req.params.id), workspaceId: ws(req) } });
    if (!run) throw notFound('Run');
    const assignments = run.status === 'done' || run.status === 'cancelled' ? await AssignmentRow.findAll({ where: { runId: run.id }, order: [['seatId', 'ASC']], raw: true }) : [];
    const body = { ...toRunDto(run, await runNumber(run)), result: run.result ?? null, assignments: assignments.map((a) => ({ seatId: a.seatId, personId: a.personId ?? null, pinned: Boolean(a.pinned) })) };
    if (FINAL_STATUSES.has(run.status)) {
      const entry = rememberRun(run.id, run.workspaceId, body);
      return void res.type('json').set('ETag', entry.etag).send(entry.json);
    }
    res.json(body);
  });
  // Live progress for the client (server-sent events); polling GET /api/runs/:id stays the fallback.
  runs.get('/:id/events', COORDINATOR_UP, validate({ params: idParams }), runEventStream(async (r) => toRunDto(r, await runNumber(r))));
  runs.post('/:id/cancel', COORDINATOR_UP, validate({ params: idParams }), async (req, res) => {
    const where = { id: Number(req.params.id), workspaceId: ws(req) };
    const run = await RunRow.findOne({ where });
    if (!run) throw notFound('Run');
    // The row decides: a queued run is cancelled at once (a worker that takes its job ends it
    // unsolved); a running one is flagged and its worker stops the solver within about 0.4 s,
    // keeping the best roster found so far. Status is part of the update's condition, so a run that
    // started between the read and the write is flagged rather than marked cancelled under its worker.
    if (run.status !== 'queued' && run.status !== 'running') throw new HttpError(409, 'conflict', `This run has already ${run.status === 'done' ? 'finished' : run.status}`);
    let changed = 0;
    if (run.status === 'queued') {
      [changed] = await RunRow.update({ status: 'cancelled', cancelRequested: true, finishedAt: new Date(), error: 'Cancelled before it started' }, { where: { ...where, status: 'queued' } });
      if (changed) await queues(RunRow.sequelize!).runs.remove(runJobId(run.id)).catch(() => {});
    }
    if (!changed) await RunRow.update({ cancelRequested: true }, { where: { ...where, status: { [Op.in]: ['queued', 'running'] } } });
    const now = (await RunRow.findOne({ where }))!;
    if (!now.cancelRequested) throw new HttpError(409, 'conflict', 'This run finished just before it could be cancelled');
    res.status(202).json(toRunDto(now, await runNumber(now)));
  });
  return [routes.router, runs.router] as const;
}
