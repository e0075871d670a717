import type { Request } from 'express';
import { ApiRoutes, STAFF_UP } from '../http/routes';
import { validate } from '../http/validate';
import { ledgerQuery, MIN_COLLEAGUES, type MyLedgerAnswer } from '../../shared/api/ledger';
import { me } from '../staff/router';
import { addCounts, dividedCounts, zeroCounts } from './count';
import { ledger } from './service';

const ws = (req: Request) => req.auth!.workspaceId;

/**
 * /api/me/ledger: a person's own line beside the team's per-person average, no one else's line.
 * Periods are counted whole (a range only picks rosters), so no two answers differ by a few days
 * of one person's work, and a period's average is withheld when fewer than MIN_COLLEAGUES others
 * were counted in it; the range's average sums only the periods shown.
 */
export function myLedgerRouter() {
  const mine = new ApiRoutes('/me');
  mine.get('/ledger', STAFF_UP, validate({ query: ledgerQuery }), async (req, res) => {
    const person = await me(req);
    const range = req.query as { from?: string; to?: string };
    const all = await ledger(ws(req), { ...range, wholePeriods: true });
    const own = all.people.find((p) => p.personId === person.id) ?? null;
    const byPeriod = all.team.byPeriod.map((t) => {
      const people = all.people.filter((p) => p.byPeriod.some((b) => b.rosterId === t.rosterId)).length;
      const colleagues = people - (own?.byPeriod.some((b) => b.rosterId === t.rosterId) ? 1 : 0);
      return { rosterId: t.rosterId, people, average: colleagues >= MIN_COLLEAGUES ? dividedCounts(t, people) : null };
    });
    const shown = byPeriod.filter((t) => t.average !== null);
    const average = zeroCounts();
    const ownShown = zeroCounts();
    for (const t of shown) {
      addCounts(average, t.average!);
      const mineThen = own?.byPeriod.find((b) => b.rosterId === t.rosterId);
      if (mineThen) addCounts(ownShown, mineThen);
    }
    const answer: MyLedgerAnswer = {
      from: all.from,
      to: all.to,
      holidays: all.holidays.map((h) => ({ date: h.date, name: h.name, source: h.source })),
      periods: all.periods,
      me: own,
      teamSize: all.people.length,
      minColleagues: MIN_COLLEAGUES,
      team: { byPeriod, rosterIds: shown.map((t) => t.rosterId), average, mine: ownShown },
    };
    res.json(answer);
  });
  return mine.router;
}
