import { Op } from 'sequelize';
import { Person } from '../db/models';
import { AssignmentRow, Roster, RunRow, SeatRow, ShiftRow } from '../rosters/models';
import { formatDay } from '../../shared/roster/derive';
import type { AbsenceConflictDto, AbsenceKindName } from '../../shared/api/absences';
import { AbsenceRow } from './models';
import { absenceSpan, periodSpan, spansOverlap } from './span';

/** How a sentence says someone is away ("Ines Varga is … on Fri 12 Mar"). */
const AWAY_WORDS: Record<AbsenceKindName, string> = {
  annual: 'on leave',
  sick: 'sick',
  training: 'in training',
  parental: 'on parental leave',
  other: 'away',
};

/**
 * The assignment people are working from: a published roster's published run, else a solved
 * roster's latest finished run (a solve or a save by hand). Drafts have none.
 */
export async function baseRunOf(workspaceId: number, roster: Roster): Promise<number | null> {
  if (roster.status === 'published') return roster.publishedRunId ?? null;
  if (roster.status !== 'solved') return null;
  const run = await RunRow.findOne({ where: { workspaceId, rosterId: roster.id, status: 'done' }, order: [['id', 'DESC']], attributes: ['id'] });
  return run?.id ?? null;
}

/**
 * Seats of published or solved rosters held by someone an approved absence takes away: the seat's
 * shift overlaps the absence in local time (both half-open spans in the roster's zone).
 */
export async function absenceConflicts(workspaceId: number, only: { rosterId?: number } = {}): Promise<AbsenceConflictDto[]> {
  const absences = await AbsenceRow.findAll({ where: { workspaceId, status: 'approved' }, order: [['startDate', 'ASC'], ['id', 'ASC']] });
  if (absences.length === 0) return [];
  const rosters = await Roster.findAll({
    where: { workspaceId, status: { [Op.in]: ['published', 'solved'] }, ...(only.rosterId ? { id: only.rosterId } : {}) },
    order: [['periodStart', 'ASC'], ['id', 'ASC']],
  });
  const people = await Person.findAll({ where: { workspaceId, id: [...new Set(absences.map((a) => a.personId))] }, attributes: ['id', 'name'] });
  const personName = new Map(people.map((p) => [p.id, p.name]));
  const out: AbsenceConflictDto[] = [];
  for (const roster of rosters) {
    const period = periodSpan({ start: roster.periodStart, end: roster.periodEnd });
    const touching = absences.filter((a) => spansOverlap(period, absenceSpan(a)));
    if (touching.length === 0) continue;
    const runId = await baseRunOf(workspaceId, roster);
    if (!runId) continue;
    const held = await AssignmentRow.findAll({ where: { workspaceId, runId, personId: [...new Set(touching.map((a) => a.personId))] }, attributes: ['seatId', 'personId'], raw: true });
    if (held.length === 0) continue;
    const seats = await SeatRow.findAll({ where: { workspaceId, id: held.map((h) => h.seatId) }, attributes: ['id', 'shiftId'], raw: true });
    const shifts = await ShiftRow.findAll({ where: { workspaceId, rosterId: roster.id, id: [...new Set(seats.map((s) => s.shiftId))] }, raw: true });
    const shiftOfSeat = new Map(seats.map((s) => [s.id, s.shiftId]));
    const shiftById = new Map(shifts.map((s) => [s.id, s]));
    const rows: AbsenceConflictDto[] = [];
    for (const h of held) {
      const shift = shiftById.get(shiftOfSeat.get(h.seatId) ?? -1);
      if (!shift || h.personId === null) continue;
      const span = { start: shift.startsLocal.slice(0, 16), end: shift.endsLocal.slice(0, 16) };
      const absence = touching.find((a) => a.personId === h.personId && spansOverlap(span, absenceSpan(a)));
      if (!absence) continue;
      const name = personName.get(h.personId) ?? 'Someone';
      const date = shift.startsLocal.slice(0, 10);
      rows.push({
        absenceId: absence.id,
        personId: h.personId,
        personName: name,
        rosterId: roster.id,
        rosterName: roster.name,
        seatId: h.seatId,
        shiftId: shift.id,
        shiftLabel: shift.label,
        date,
        message: `${name} is ${AWAY_WORDS[absence.kind]} on ${formatDay(date)}; their ${shift.label} shift needs cover`,
      });
    }
    rows.sort((a, b) => (shiftById.get(a.shiftId)!.startsLocal < shiftById.get(b.shiftId)!.startsLocal ? -1 : 1) || a.seatId - b.seatId);
    out.push(...rows);
  }
  return out;
}
