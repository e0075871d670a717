import type { Request } from 'express';
import { ApiRoutes, STAFF_UP } from '../http/routes';
import { validate } from '../http/validate';
import { ledgerQuery } from '../../shared/api/ledger';
import { me } from '../staff/router';
import { ledger } from './service';

const ws = (req: Request) => req.auth!.workspaceId;

/** /api/me/ledger: a person's own line beside the team's per-person average, no one else's counts by name. */
export function myLedgerRouter() {
  const mine = new ApiRoutes('/me');
  mine.get('/ledger', STAFF_UP, validate({ query: ledgerQuery }), async (req, res) => {
    const person = await me(req);
    const all = await ledger(ws(req), req.query as { from?: string; to?: string });
    const own = all.people.find((p) => p.personId === person.id) ?? null;
    res.json({ from: all.from, to: all.to, periods: all.periods, holidays: all.holidays, me: own, teamSize: all.people.length, team: all.team });
  });
  return mine.router;
}
