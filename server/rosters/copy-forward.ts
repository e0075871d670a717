/**
 * Copy forward: a new roster made from an earlier one with the period moved. The setup that
 * repeats from period to period (shift patterns, hand-added shifts, rules, wish settings) is
 * copied; wishes are not (they are said for one period), and neither are pins or runs. Terms and
 * pairings are kept per person, so they already hold for any later roster; the answer counts them.
 */
import { Op } from 'sequelize';
import { transactionWithRetry } from '../db/sequelize';
import { Person } from '../db/models';
import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { HttpError } from '../http/errors';
import { enforcePlanLimit } from '../billing/limits';
import { rosterIdParams } from '../../shared/api/rosters';
import { copyForwardBody, type CopyForwardResult } from '../../shared/api/copy-forward';
import { addLocalDays, daysBetween } from '../../shared/roster/time';
import { localDateSchema } from '../../shared/roster/schema';
import { PairingRow, Roster, SeatRow, ShiftPatternRow, ShiftRow, WishRow } from './models';
import { expandPattern, findRoster, toRosterDto } from './repository';
import { termsForPeriod } from '../terms/repository';

const moveStamp = (local: string, days: number) => `${addLocalDays(local.slice(0, 10), days)}${local.slice(10)}`;

export async function copyForward(workspaceId: number, sourceId: number, body: { name: string; periodStart: string }): Promise<CopyForwardResult> {
  const source = await findRoster(workspaceId, sourceId);
  const offset = daysBetween(source.periodStart, body.periodStart);
  if (offset === 0) throw new HttpError(422, 'unprocessable', 'The copy would cover the same days as the roster it is made from. Pick another first day.', [{ path: 'body.periodStart', message: 'same period as the original' }]);
  const periodEnd = addLocalDays(source.periodEnd, offset);
  if (!localDateSchema.safeParse(periodEnd).success) throw new HttpError(422, 'unprocessable', `Moved to start on ${body.periodStart}, the roster would end after the last date Rotaloom takes.`, [{ path: 'body.periodStart', message: 'the copied period would end out of range' }]);
  const result = await transactionWithRetry(Roster.sequelize!, async (transaction) => {
    const roster = await Roster.create(
      {
        workspaceId,
        name: body.name,
        periodStart: body.periodStart,
        periodEnd,
        timeZone: source.timeZone,
        rules: source.rules,
        wishDeadline: source.wishDeadline ? new Date(new Date(source.wishDeadline).getTime() + offset * 86_400_000) : null,
        maxCannotDays: source.maxCannotDays ?? null,
      },
      { transaction },
    );
    const patterns = await ShiftPatternRow.findAll({ where: { workspaceId, rosterId: sourceId }, order: [['id', 'ASC']], transaction });
    let fromPatterns = 0;
    const made: Array<{ patternId: number | null; label: string; startsLocal: string; endsLocal: string; night: boolean | null; seats: Array<{ skillId: number | null }> }> = [];
    for (const p of patterns) {
      const copy = await ShiftPatternRow.create(
        { workspaceId, rosterId: roster.id, label: p.label, weekdays: p.weekdays, startTime: p.startTime, endTime: p.endTime, seats: p.seats, night: p.night ?? null },
        { transaction },
      );
      // Made afresh over the new period, so weekdays land on the right dates whatever the offset.
      const shifts = expandPattern(roster, { label: p.label, weekdays: p.weekdays, startTime: p.startTime, endTime: p.endTime, seats: p.seats, night: p.night });
      fromPatterns += shifts.length;
      made.push(...shifts.map((s) => ({ ...s, patternId: copy.id })));
    }
    // Shifts added by hand move by the same number of days as the period (so they stay inside it).
    const hand = await ShiftRow.findAll({ where: { workspaceId, rosterId: sourceId, patternId: { [Op.is]: null } }, order: [['startsLocal', 'ASC'], ['id', 'ASC']], transaction });
    const handSeats = await SeatRow.findAll({ where: { workspaceId, shiftId: hand.map((s) => s.id) }, order: [['position', 'ASC']], transaction });
    for (const s of hand) {
      made.push({ patternId: null, label: s.label, startsLocal: moveStamp(s.startsLocal, offset), endsLocal: moveStamp(s.endsLocal, offset), night: s.night ?? null, seats: handSeats.filter((x) => x.shiftId === s.id).map((x) => ({ skillId: x.skillId ?? null })) });
    }
    const rows = await ShiftRow.bulkCreate(
      made.map((s) => ({ workspaceId, rosterId: roster.id, patternId: s.patternId, label: s.label, startsLocal: s.startsLocal, endsLocal: s.endsLocal, night: s.night })),
      { transaction },
    );
    await SeatRow.bulkCreate(
      rows.flatMap((row, i) => made[i].seats.map((seat, position) => ({ workspaceId, shiftId: row.id, skillId: seat.skillId, position }))),
      { transaction },
    );
    return { roster, patterns: patterns.length, fromPatterns, handCopied: hand.length };
  });
  const [terms, pairings, wishes, people] = await Promise.all([
    termsForPeriod(workspaceId, { start: body.periodStart, end: periodEnd }),
    PairingRow.findAll({ where: { workspaceId, status: 'approved' }, attributes: ['personAId', 'personBId'] }),
    WishRow.count({ where: { workspaceId, rosterId: sourceId } }),
    Person.findAll({ where: { workspaceId, archivedAt: null }, attributes: ['id'] }),
  ]);
  // Counted as the new roster's solve will see them: archived people never reach a new roster.
  const active = new Set(people.map((p) => p.id));
  return {
    roster: toRosterDto(result.roster),
    shiftedByDays: offset,
    copied: { patterns: result.patterns, shiftsFromPatterns: result.fromPatterns, handShifts: result.handCopied, rules: true },
    inForce: { peopleWithTerms: [...terms.keys()].filter((id) => active.has(id)).length, pairings: pairings.filter((p) => active.has(p.personAId) && active.has(p.personBId)).length },
    leftBehind: { wishes },
  };
}

/** POST /api/rosters/:rosterId/copy-forward (a new roster counts against the plan like any other). */
export function copyForwardRouter() {
  const r = new ApiRoutes('/rosters');
  r.post('/:rosterId/copy-forward', COORDINATOR_UP, validate({ params: rosterIdParams, body: copyForwardBody }), enforcePlanLimit('activeRosters'), async (req, res) => {
    res.status(201).json(await copyForward(req.auth!.workspaceId, Number(req.params.rosterId), req.body));
  });
  return r.router;
}
