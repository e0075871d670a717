import { Op } from 'sequelize';
import { Person } from '../db/models';
import { rosterIds } from '../rosters/ids';
import type { Absence } from '../../shared/roster/schema';
import { AbsenceRow } from './models';
import { absenceSettings } from './repository';
import { absenceSpan, creditedHours, periodSpan } from './span';

/**
 * Approved absences touching a roster period, in the roster JSON format: whole days run from 00:00
 * to 00:00 of the day after, part days keep their times, and both ends are clipped to the period.
 * creditHours are the hours credited inside the period only, so a fortnight's leave across two
 * rosters is not counted twice.
 */
export async function absencesForRoster(workspaceId: number, period: { start: string; end: string }, onlyPeople?: number[]): Promise<Absence[]> {
  const rows = await AbsenceRow.findAll({
    where: {
      workspaceId,
      status: 'approved',
      startDate: { [Op.lte]: period.end },
      endDate: { [Op.gte]: period.start },
      // Only the people the roster has (the caller's list), or the file would name someone unknown.
      ...(onlyPeople ? { personId: onlyPeople } : {}),
    },
    order: [['personId', 'ASC'], ['startDate', 'ASC'], ['id', 'ASC']],
  });
  if (rows.length === 0) return [];
  const [settings, people] = await Promise.all([
    absenceSettings(workspaceId),
    Person.findAll({ where: { workspaceId, id: [...new Set(rows.map((r) => r.personId))] }, attributes: ['id', 'contractedHours'] }),
  ]);
  const contracted = new Map(people.map((p) => [p.id, p.contractedHours]));
  const bounds = periodSpan(period);
  const out: Absence[] = [];
  for (const r of rows) {
    const span = absenceSpan(r);
    const start = span.start < bounds.start ? bounds.start : span.start;
    const end = span.end > bounds.end ? bounds.end : span.end;
    if (end <= start) continue; // e.g. a part day ending at 00:00 of the first day
    out.push({
      person: rosterIds.person(r.personId),
      kind: r.kind,
      start,
      end,
      creditHours: creditedHours(r, settings.credits[r.kind], contracted.get(r.personId) ?? 0, { from: period.start, to: period.end }),
    });
  }
  return out;
}
