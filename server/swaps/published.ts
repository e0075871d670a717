import type { Transaction } from 'sequelize';
import { HttpError } from '../http/errors';
import { transactionWithRetry } from '../db/sequelize';
import { AssignmentRow, Roster, RunRow, SeatRow, ShiftRow } from '../rosters/models';
import { rosterIds } from '../rosters/ids';
import { runAssignment } from '../runs/run-view';
import { peopleSummary } from '../runs/manual';
import { finite } from '../runs/execute';
import { scoreRoster } from '../../solver/roster';
import { localDateTimeToInstant } from '../../shared/roster/time';
import type { ChangeCheck } from '../../shared/api/swaps';
import { checkChange, type Moves } from './check';
import { snapshotAfterChange } from './snapshot';

/** A seat of the workspace with its shift and the shift's roster, or a 422 naming the field. */
export async function seatOnRoster(workspaceId: number, seatId: number, field: string) {
  const seat = await SeatRow.findOne({ where: { id: seatId, workspaceId } });
  const shift = seat ? await ShiftRow.findOne({ where: { id: seat.shiftId, workspaceId } }) : null;
  const roster = shift ? await Roster.findOne({ where: { id: shift.rosterId, workspaceId } }) : null;
  if (!seat || !shift || !roster) throw new HttpError(422, 'unprocessable', 'That shift is not on a roster of this workspace.', [{ path: field, message: 'no such seat in this workspace' }]);
  return { seat, shift, roster };
}

export function assertPublished(roster: Roster, field: string): void {
  if (roster.status !== 'published' || !roster.publishedRunId) {
    throw new HttpError(422, 'unprocessable', `${roster.name} is not published, so its shifts cannot be swapped or offered yet.`, [{ path: field, message: 'roster is not published' }]);
  }
}

export function assertFuture(shift: ShiftRow, timeZone: string, field: string, now = Date.now()): void {
  if (localDateTimeToInstant(shift.startsLocal, timeZone) <= now) {
    throw new HttpError(422, 'unprocessable', `The ${shift.label} shift of ${shift.startsLocal.slice(0, 10)} has already started, so it cannot change hands.`, [{ path: field, message: 'shift has started or is past' }]);
  }
}

/** The published run's filling in roster JSON ids, with the roster as it stands now. */
export async function publishedFilling(workspaceId: number, roster: Roster) {
  const { roster: json, assignment } = await runAssignment(workspaceId, roster.publishedRunId!);
  return { json, assignment, runId: roster.publishedRunId! };
}

export interface Change {
  /** Seat (db id) → person (db id) each seat must still hold, or the change is stale. */
  expect: Array<{ seatId: number; personId: number | null; field: string }>;
  /** Seat (db id) → who holds it after. */
  moves: Array<{ seatId: number; shiftId: number; from: number | null; to: number | null }>;
  /** What the new run records it was made for. */
  reason: { kind: 'swap' | 'offer'; id: number };
}

const toMoves = (change: Change): Moves => Object.fromEntries(change.moves.map((m) => [rosterIds.seat(m.seatId), m.to === null ? null : rosterIds.person(m.to)]));

/**
 * Makes the change on the published roster: under the roster row's lock (so two approvals run
 * one after the other), it checks the seats still hold who they held, checks the changed roster
 * again against every hard rule, stores it as a new finished run, makes that run the published
 * one and moves the snapshot on. `within` runs in the same transaction (marking the swap or
 * offer approved), so either all of it happens or none.
 */
export async function applyChange(workspaceId: number, rosterId: number, change: Change, within: (t: Transaction, result: { runId: number; check: ChangeCheck }) => Promise<void>) {
  return transactionWithRetry(Roster.sequelize!, async (transaction) => {
    const roster = await Roster.findOne({ where: { id: rosterId, workspaceId }, transaction, lock: transaction.LOCK.UPDATE });
    if (!roster) throw new HttpError(404, 'not_found', 'Roster not found');
    assertPublished(roster, 'params.id');
    const { json, assignment, runId: baseRunId } = await publishedFilling(workspaceId, roster);
    for (const e of change.expect) {
      const now = assignment[rosterIds.seat(e.seatId)] ?? null;
      const wanted = e.personId === null ? null : rosterIds.person(e.personId);
      if (now !== wanted) throw new HttpError(409, 'conflict', 'The published roster changed since this was proposed: that shift is no longer held as it was. Propose it again.', [{ path: e.field, message: 'seat changed hands since' }]);
    }
    const moves = toMoves(change);
    const check = checkChange(json, assignment, moves);
    if (!check.ok) throw new HttpError(422, 'unprocessable', check.words[0], check.breaches.map((message) => ({ path: 'body.decision', message })));
    const filled = { ...assignment, ...moves };
    const score = scoreRoster(json, filled);
    const now = new Date();
    const base = await RunRow.findOne({ where: { id: baseRunId, workspaceId }, transaction });
    const run = await RunRow.create(
      {
        workspaceId,
        rosterId,
        status: 'done',
        parameters: { timeLimitSeconds: 0, seed: 0, manual: true, basedOnRunId: baseRunId, change: change.reason } as never,
        score: finite(score.total),
        bound: null,
        gap: null,
        rosterVersion: base?.rosterVersion ?? roster.version,
        startedAt: now,
        finishedAt: now,
        timeMs: 0,
        result: {
          manual: true,
          change: change.reason,
          feasible: score.feasible,
          optimal: false,
          stopReason: 'manual',
          method: 'manual',
          checkedScore: finite(score.total),
          terms: score.terms,
          hardCounts: score.hardCounts,
          violations: score.violations.slice().sort((a, b) => a.points - b.points).slice(0, 500).map((v) => ({ ...v, points: finite(v.points) })),
          violationCount: score.violations.length,
          openSeats: Object.values(filled).filter((p) => p === null).length,
          people: peopleSummary(json, filled),
        } as object,
      },
      { transaction },
    );
    const rows = await AssignmentRow.findAll({ where: { workspaceId, runId: baseRunId }, transaction });
    const moved = new Map(change.moves.map((m) => [m.seatId, m.to]));
    const seen = new Set<number>();
    const copy = rows.map((r) => {
      seen.add(r.seatId);
      return { workspaceId, runId: run.id, seatId: r.seatId, personId: moved.has(r.seatId) ? moved.get(r.seatId)! : r.personId, pinned: r.pinned };
    });
    for (const m of change.moves) if (!seen.has(m.seatId)) copy.push({ workspaceId, runId: run.id, seatId: m.seatId, personId: m.to, pinned: false });
    await AssignmentRow.bulkCreate(copy, { transaction });
    const publishedSnapshot = await snapshotAfterChange(workspaceId, roster, run.id, now, change.moves);
    await Roster.update({ publishedRunId: run.id, publishedSnapshot, version: roster.version + 1 }, { where: { id: rosterId, workspaceId }, transaction });
    await within(transaction, { runId: run.id, check });
    return { runId: run.id, previousRunId: baseRunId, check };
  });
}
