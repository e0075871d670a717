import { Roster, AssignmentRow, PinRow, RunRow } from '../rosters/models';
import { HttpError } from '../http/errors';
import { rosterIds, parseRosterId } from '../rosters/ids';
import { scoreRoster } from '../../solver/roster';
import type { Roster as RosterJson, RosterAssignment } from '../../shared/roster/schema';
import { shiftFacts, contractedTarget, periodDays } from '../../shared/roster/derive';
import { finite } from './execute';
import { assembleValidRoster } from '../rosters/assemble';

/** Per-person shifts, hours, nights and weekend shifts of a filled roster (the same summary a solved run keeps). */
export function peopleSummary(roster: RosterJson, assignment: RosterAssignment) {
  const facts = shiftFacts(roster);
  const shiftIdx = new Map(roster.shifts.map((s, i) => [s.id, i]));
  const days = periodDays(roster);
  const people = new Map(
    roster.people.map((p) => {
      const target = contractedTarget(p, days);
      return [p.id, { personId: p.id, name: p.name, shifts: 0, hours: 0, nights: 0, weekendShifts: 0, ...(target !== undefined ? { contractedHours: target } : {}) }];
    }),
  );
  for (const seat of roster.seats) {
    const pid = assignment[seat.id];
    const p = pid ? people.get(pid) : undefined;
    if (!p) continue;
    const f = facts[shiftIdx.get(seat.shift)!];
    p.shifts += 1;
    p.hours += f.hours;
    if (f.night) p.nights += 1;
    if (f.weekend) p.weekendShifts += 1;
  }
  return [...people.values()].map((p) => ({ ...p, hours: Math.round(p.hours * 100) / 100 }));
}

/**
 * Saves a hand-edited roster as a finished "manual" run. The roster version the editor started
 * from must still be current (a stale save is a 409 and stores nothing); saving bumps the
 * version, so a second editor working from the same version is told too. A roster breaking a
 * hard rule is refused in words.
 */
export async function saveManualRun(workspaceId: number, rosterId: number, body: { assignment: Record<string, number | null>; version: number; basedOnRunId?: number | null }) {
  const { roster, version } = await assembleValidRoster(workspaceId, rosterId);
  const row = (await Roster.findOne({ where: { id: rosterId, workspaceId } }))!;
  if (row.status === 'published') throw new HttpError(409, 'conflict', 'This roster is published. Reopen it for changes before saving edits.', [{ path: 'body.version', message: 'roster is published' }]);
  if (version !== body.version) {
    throw new HttpError(409, 'conflict', 'Someone changed this roster (shifts, wishes, pins or another saved edit) after you started editing. Your edits are still on your screen: check the latest roster, then save again.', [
      { path: 'body.version', message: `you started from version ${body.version}; the current one is ${version}` },
    ]);
  }
  const known = new Set(roster.seats.map((s) => s.id));
  const assignment: RosterAssignment = {};
  for (const seat of roster.seats) assignment[seat.id] = null;
  for (const [seat, person] of Object.entries(body.assignment)) {
    const key = rosterIds.seat(Number(seat));
    if (!known.has(key)) throw new HttpError(422, 'unprocessable', `Seat ${seat} is not part of this roster`, [{ path: `body.assignment.${seat}`, message: 'unknown seat' }]);
    assignment[key] = person === null ? null : rosterIds.person(person);
  }
  const check = scoreRoster(roster, assignment);
  if (!check.feasible) {
    const hard = check.violations.filter((v) => v.hard);
    throw new HttpError(422, 'unprocessable', `This roster breaks ${hard.length} hard rule${hard.length === 1 ? '' : 's'}: ${hard.slice(0, 3).map((v) => v.message).join('; ')}${hard.length > 3 ? '; …' : ''}`, hard.slice(0, 20).map((v) => ({ path: `body.assignment.${v.seats[0] ? parseRosterId('st', v.seats[0]) : ''}`, message: v.message })));
  }
  const pins = new Set((await PinRow.findAll({ where: { workspaceId, rosterId } })).map((p) => p.seatId));
  const sequelize = Roster.sequelize!;
  return sequelize.transaction(async (transaction) => {
    const [bumped] = await Roster.update({ version: body.version + 1, status: 'solved' }, { where: { id: rosterId, workspaceId, version: body.version }, transaction });
    if (bumped === 0) throw new HttpError(409, 'conflict', 'Someone changed this roster while you were saving. Your edits are still on your screen: save again.', [{ path: 'body.version', message: 'the roster moved on' }]);
    const violations = check.violations.slice().sort((a, b) => a.points - b.points);
    const now = new Date();
    const run = await RunRow.create(
      {
        workspaceId,
        rosterId,
        status: 'done',
        parameters: { timeLimitSeconds: 0, seed: 0, manual: true, basedOnRunId: body.basedOnRunId ?? null } as never,
        score: finite(check.total),
        bound: null,
        gap: null,
        rosterVersion: body.version + 1,
        startedAt: now,
        finishedAt: now,
        timeMs: 0,
        result: {
          manual: true,
          feasible: true,
          optimal: false,
          stopReason: 'manual',
          method: 'manual',
          checkedScore: finite(check.total),
          terms: check.terms,
          hardCounts: check.hardCounts,
          violations: violations.slice(0, 500).map((v) => ({ ...v, points: finite(v.points) })),
          violationCount: violations.length,
          openSeats: Object.values(assignment).filter((p) => p === null).length,
          people: peopleSummary(roster, assignment),
        } as object,
      },
      { transaction },
    );
    await AssignmentRow.bulkCreate(
      Object.entries(assignment).map(([seat, person]) => {
        const seatId = parseRosterId('st', seat);
        return { workspaceId, runId: run.id, seatId, personId: person ? parseRosterId('p', person) : null, pinned: pins.has(seatId) };
      }),
      { transaction },
    );
    return { runId: run.id, score: finite(check.total), version: body.version + 1 };
  });
}
