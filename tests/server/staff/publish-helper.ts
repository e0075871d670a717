import { AssignmentRow, Roster, RunRow, SeatRow, ShiftRow } from '../../../server/rosters/models';

/**
 * Publishes a roster straight in the database, as the coordinator's publish does in the end
 * (status published, published_run_id, published_at): a finished run holding exactly the given
 * seat → person choices. Lets the staff tests (and the browser test) publish without a solve.
 * Returns the new run and the run that was published before it, if any.
 */
export async function publishDirectly(
  workspaceId: number,
  rosterId: number,
  assignments: Array<{ seatId: number; personId: number | null }>,
): Promise<{ runId: number; previousRunId: number | null }> {
  const roster = await Roster.findOne({ where: { id: rosterId, workspaceId } });
  if (!roster) throw new Error(`publishDirectly: no roster ${rosterId} in workspace ${workspaceId}`);
  const previousRunId = roster.publishedRunId ?? null;
  const now = new Date();
  const run = await RunRow.create({
    workspaceId,
    rosterId,
    status: 'done',
    parameters: { timeLimitSeconds: 1, seed: 1 },
    rosterVersion: roster.version,
    startedAt: now,
    finishedAt: now,
    result: { feasible: true, publishedBy: 'test helper' } as object,
  });
  await AssignmentRow.bulkCreate(assignments.map((a) => ({ workspaceId, runId: run.id, seatId: a.seatId, personId: a.personId, pinned: false })));
  // A later publish must carry a later stamp even within the same second (DTSTAMP has seconds).
  const publishedAt = roster.publishedAt && new Date(roster.publishedAt).getTime() >= now.getTime() - 1000 ? new Date(new Date(roster.publishedAt).getTime() + 1000) : now;
  await Roster.update({ status: 'published', publishedRunId: run.id, publishedAt, version: roster.version + 1 }, { where: { id: rosterId, workspaceId } });
  return { runId: run.id, previousRunId };
}

/** The roster's seats with their shift's label and local times, in start order. */
export async function seatsOf(workspaceId: number, rosterId: number) {
  const shifts = await ShiftRow.findAll({ where: { workspaceId, rosterId }, order: [['startsLocal', 'ASC'], ['id', 'ASC']] });
  const seats = await SeatRow.findAll({ where: { workspaceId, shiftId: shifts.map((s) => s.id) }, order: [['shiftId', 'ASC'], ['position', 'ASC']] });
  return shifts.flatMap((shift) =>
    seats.filter((s) => s.shiftId === shift.id).map((seat) => ({ seatId: seat.id, shiftId: shift.id, label: shift.label, startsLocal: shift.startsLocal, endsLocal: shift.endsLocal, position: seat.position })),
  );
}
