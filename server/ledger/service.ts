import { Op } from 'sequelize';
import { Person } from '../db/models';
import { AssignmentRow, Roster, SeatRow, ShiftRow, WishRow } from '../rosters/models';
import { OfferRow, SwapRow } from '../swaps/models';
import type { LedgerAnswer, LedgerCounts } from '../../shared/api/ledger';
import { addCounts, countPeriod, zeroCounts } from './count';
import { holidaysBetween } from './holidays';

/** Rosters with a published run whose period meets [from, to] (either end open). */
async function publishedIn(workspaceId: number, from?: string, to?: string) {
  return Roster.findAll({
    where: {
      workspaceId,
      publishedRunId: { [Op.ne]: null },
      ...(from ? { periodEnd: { [Op.gte]: from } } : {}),
      ...(to ? { periodStart: { [Op.lte]: to } } : {}),
    },
    order: [['periodStart', 'ASC'], ['id', 'ASC']],
  });
}

/**
 * The ledger: for each person, across every published roster in the range, the counts of
 * server/ledger/count.ts, per period and in total, and the team's sums. Swaps count the approved
 * swaps and giveaways a person was part of and the offered shifts they were given.
 * `wholePeriods` counts every roster meeting the range over its whole period instead of clipping
 * it to the range (the staff view: team figures then only ever sum whole periods).
 */
export async function ledger(workspaceId: number, range: { from?: string; to?: string; wholePeriods?: boolean } = {}): Promise<LedgerAnswer> {
  const rosters = await publishedIn(workspaceId, range.from, range.to);
  const clip = range.wholePeriods ? {} : { from: range.from, to: range.to };
  const start = clip.from ?? rosters.reduce<string | null>((m, r) => (m && m < r.periodStart ? m : r.periodStart), null);
  const end = clip.to ?? rosters.reduce<string | null>((m, r) => (m && m > r.periodEnd ? m : r.periodEnd), null);
  const holidays = start && end ? await holidaysBetween(workspaceId, start, end) : [];
  const holidaySet = new Set(holidays.map((h) => h.date));
  const people = await Person.findAll({ where: { workspaceId }, attributes: ['id', 'name', 'contractedHours', 'archivedAt'] });
  const contracts = new Map(people.map((p) => [p.id, Number(p.contractedHours) || 0]));
  const perPerson = new Map<number, { totals: LedgerCounts; byPeriod: Array<{ rosterId: number } & LedgerCounts> }>();
  const team = { totals: zeroCounts(), byPeriod: [] as Array<{ rosterId: number } & LedgerCounts> };
  const rosterIds = rosters.map((r) => r.id);
  const swaps = rosterIds.length ? await SwapRow.findAll({ where: { workspaceId, rosterId: rosterIds, status: 'approved' } }) : [];
  const offers = rosterIds.length ? await OfferRow.findAll({ where: { workspaceId, rosterId: rosterIds, status: 'approved' } }) : [];

  for (const roster of rosters) {
    const shifts = await ShiftRow.findAll({ where: { workspaceId, rosterId: roster.id }, attributes: ['id', 'startsLocal', 'endsLocal', 'night'] });
    const assignments = await AssignmentRow.findAll({ where: { workspaceId, runId: roster.publishedRunId!, personId: { [Op.ne]: null } }, attributes: ['seatId', 'personId'] });
    const seats = assignments.length ? await SeatRow.findAll({ where: { workspaceId, id: assignments.map((a) => a.seatId) }, attributes: ['id', 'shiftId'] }) : [];
    const shiftOfSeat = new Map(seats.map((s) => [s.id, s.shiftId]));
    const workers = new Map<number, number[]>();
    for (const a of assignments) {
      const shiftId = shiftOfSeat.get(a.seatId);
      if (shiftId !== undefined) workers.set(shiftId, [...(workers.get(shiftId) ?? []), a.personId!]);
    }
    const wishes = await WishRow.findAll({ where: { workspaceId, rosterId: roster.id }, attributes: ['personId', 'shiftId', 'date', 'kind'] });
    const clipStart = clip.from && clip.from > roster.periodStart ? clip.from : roster.periodStart;
    const clipEnd = clip.to && clip.to < roster.periodEnd ? clip.to : roster.periodEnd;
    const counts = countPeriod({
      timeZone: roster.timeZone,
      start: clipStart,
      end: clipEnd,
      shifts: shifts.map((s) => ({ id: s.id, startsLocal: s.startsLocal, endsLocal: s.endsLocal, night: s.night ?? null })),
      workers,
      wishes: wishes.map((w) => ({ personId: w.personId, shiftId: w.shiftId ?? null, date: w.date ?? null, kind: w.kind })),
      contracts,
      holidays: holidaySet,
    });
    const bump = (personId: number) => {
      if (!counts.has(personId)) counts.set(personId, zeroCounts());
      counts.get(personId)!.swaps += 1;
    };
    for (const s of swaps.filter((x) => x.rosterId === roster.id)) {
      bump(s.proposerPersonId);
      bump(s.colleaguePersonId);
    }
    for (const o of offers.filter((x) => x.rosterId === roster.id && x.takerPersonId)) bump(o.takerPersonId!);
    const teamPeriod = { rosterId: roster.id, ...zeroCounts() };
    for (const [personId, c] of counts) {
      const entry = perPerson.get(personId) ?? perPerson.set(personId, { totals: zeroCounts(), byPeriod: [] }).get(personId)!;
      entry.byPeriod.push({ rosterId: roster.id, ...c });
      addCounts(entry.totals, c);
      addCounts(teamPeriod, c);
    }
    team.byPeriod.push(teamPeriod);
    addCounts(team.totals, teamPeriod);
  }
  const name = new Map(people.map((p) => [p.id, p.name]));
  return {
    from: start,
    to: end,
    holidays,
    periods: rosters.map((r) => ({ rosterId: r.id, name: r.name, start: r.periodStart, end: r.periodEnd })),
    people: [...perPerson.entries()]
      .map(([personId, v]) => ({ personId, name: name.get(personId) ?? `person ${personId}`, ...v }))
      .sort((a, b) => a.name.localeCompare(b.name)),
    team,
  };
}
