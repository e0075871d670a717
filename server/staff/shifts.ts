import { Op } from 'sequelize';
import { TZDate } from '@date-fns/tz';
import { format } from 'date-fns';
import { Person, Workspace } from '../db/models';
import { AssignmentRow, Roster, SeatRow, ShiftRow } from '../rosters/models';
import { addLocalDays, isoWeekday, localDateTimeToInstant } from '../../shared/roster/time';
import type { MyShift, MyShiftsAnswer } from '../../shared/api/staff';

const HOUR = 3_600_000;

/** Today's date where the workspace is. */
export function localToday(timeZone: string, now = Date.now()): string {
  return format(new TZDate(now, timeZone), 'yyyy-MM-dd');
}

/** Monday of the ISO week that holds `day`. */
export const weekStartOf = (day: string) => addLocalDays(day, 1 - isoWeekday(day));

/**
 * The shifts of one run (a published one) for the given people, with co-workers by name only.
 * Elapsed hours go through the roster's time zone, so a night across a clock change counts its
 * real length.
 */
export async function shiftsOfRun(
  workspaceId: number,
  roster: Pick<Roster, 'id' | 'name' | 'timeZone'>,
  runId: number,
  personIds: number[] | 'all',
): Promise<Map<number, MyShift[]>> {
  const all = await AssignmentRow.findAll({ where: { workspaceId, runId, personId: { [Op.ne]: null } } });
  const mine = personIds === 'all' ? all : all.filter((a) => personIds.includes(a.personId!));
  const out = new Map<number, MyShift[]>();
  if (mine.length === 0) return out;
  const seats = await SeatRow.findAll({ where: { workspaceId, id: all.map((a) => a.seatId) } });
  const shiftOfSeat = new Map(seats.map((s) => [s.id, s.shiftId]));
  const shifts = await ShiftRow.findAll({ where: { workspaceId, rosterId: roster.id, id: [...new Set(seats.map((s) => s.shiftId))] } });
  const shiftById = new Map(shifts.map((s) => [s.id, s]));
  const people = await Person.findAll({ where: { workspaceId, id: [...new Set(all.map((a) => a.personId!))] }, attributes: ['id', 'name'] });
  const nameOf = new Map(people.map((p) => [p.id, p.name]));
  const peopleOnShift = new Map<number, number[]>();
  for (const a of all) {
    const shiftId = shiftOfSeat.get(a.seatId);
    if (shiftId === undefined) continue;
    peopleOnShift.set(shiftId, [...(peopleOnShift.get(shiftId) ?? []), a.personId!]);
  }
  for (const a of mine) {
    const shift = shiftById.get(shiftOfSeat.get(a.seatId) ?? -1);
    if (!shift) continue; // a seat of a shift deleted after publishing
    const start = localDateTimeToInstant(shift.startsLocal, roster.timeZone);
    const end = localDateTimeToInstant(shift.endsLocal, roster.timeZone);
    const coworkers = (peopleOnShift.get(shift.id) ?? [])
      .filter((p) => p !== a.personId)
      .map((p) => nameOf.get(p) ?? 'someone')
      .sort((x, y) => x.localeCompare(y));
    const list = out.get(a.personId!) ?? [];
    list.push({
      seatId: a.seatId,
      shiftId: shift.id,
      rosterId: roster.id,
      rosterName: roster.name,
      label: shift.label,
      startsLocal: shift.startsLocal,
      endsLocal: shift.endsLocal,
      startsAt: new Date(start).toISOString(),
      endsAt: new Date(end).toISOString(),
      timeZone: roster.timeZone,
      hours: Math.round(((end - start) / HOUR) * 100) / 100,
      night: shift.night ?? null,
      coworkers: [...new Set(coworkers)],
    });
    out.set(a.personId!, list);
  }
  for (const list of out.values()) list.sort((x, y) => x.startsAt.localeCompare(y.startsAt) || x.seatId - y.seatId);
  return out;
}

/**
 * Every roster of the workspace with a published run. A roster a coordinator reopened keeps its
 * published run until the next publish, and that run is still what people work by.
 */
export async function publishedRosters(workspaceId: number): Promise<Roster[]> {
  return Roster.findAll({ where: { workspaceId, publishedRunId: { [Op.ne]: null }, publishedAt: { [Op.ne]: null } }, order: [['periodStart', 'ASC'], ['id', 'ASC']] });
}

/** A person's shifts across every published roster, earliest first. */
export async function publishedShiftsOf(workspaceId: number, personId: number): Promise<{ shifts: MyShift[]; rosters: Roster[] }> {
  const rosters = await publishedRosters(workspaceId);
  const shifts: MyShift[] = [];
  for (const roster of rosters) {
    shifts.push(...((await shiftsOfRun(workspaceId, roster, roster.publishedRunId!, [personId])).get(personId) ?? []));
  }
  shifts.sort((x, y) => x.startsAt.localeCompare(y.startsAt) || x.seatId - y.seatId);
  return { shifts, rosters };
}

export async function myShifts(workspaceId: number, person: Person, week?: string, now = Date.now()): Promise<MyShiftsAnswer> {
  const workspace = await Workspace.findByPk(workspaceId);
  const timeZone = workspace?.timeZone ?? 'UTC';
  const today = localToday(timeZone, now);
  const { shifts } = await publishedShiftsOf(workspaceId, person.id);
  const start = weekStartOf(week ?? today);
  const end = addLocalDays(start, 6);
  // A shift counts in the week its start falls in, on the wall clock of its roster.
  const inWeek = shifts.filter((s) => s.startsLocal.slice(0, 10) >= start && s.startsLocal.slice(0, 10) <= end);
  const hours = Math.round(inWeek.reduce((sum, s) => sum + s.hours, 0) * 100) / 100;
  return {
    person: { id: person.id, name: person.name, contractedHours: person.contractedHours },
    timeZone,
    today,
    shifts,
    week: { start, end, hours, contractedHours: person.contractedHours, shifts: inWeek.length },
  };
}
