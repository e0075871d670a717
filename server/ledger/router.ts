import type { Request } from 'express';
import { UniqueConstraintError } from 'sequelize';
import { ApiRoutes, COORDINATOR_UP, STAFF_UP } from '../http/routes';
import { HttpError } from '../http/errors';
import { validate } from '../http/validate';
import { idParams } from '../../shared/api/paging';
import { holidayBody, ledgerQuery, ledgerSettingsBody, type LedgerSettingsDto } from '../../shared/api/ledger';
import { me } from '../staff/router';
import { HolidayRow, LedgerSettingsRow } from '../swaps/models';
import { assertRegion, holidaysBetween, ledgerSettings } from './holidays';
import { ledger } from './service';
import { localToday } from '../staff/shifts';
import { addLocalDays } from '../../shared/roster/time';
import { Workspace } from '../db/models';

const ws = (req: Request) => req.auth!.workspaceId;

async function settingsDto(workspaceId: number): Promise<LedgerSettingsDto> {
  const s = await ledgerSettings(workspaceId);
  const workspace = await Workspace.findByPk(workspaceId);
  const today = localToday(workspace?.timeZone ?? 'UTC');
  // The calendar shown: the year before today to the year after, enough to plan and look back.
  const holidays = await holidaysBetween(workspaceId, addLocalDays(today, -366), addLocalDays(today, 366), s.region);
  return { region: s.region ?? null, nightWeight: s.nightWeight, weekendWeight: s.weekendWeight, lookbackDays: s.lookbackDays, version: s.version, holidays };
}

/** The fairness ledger, its holiday calendar and its weights (coordinators); staff see their own line. */
export function ledgerRouters() {
  const r = new ApiRoutes('/ledger');
  r.get('/', COORDINATOR_UP, validate({ query: ledgerQuery }), async (req, res) => {
    res.json(await ledger(ws(req), req.query as { from?: string; to?: string }));
  });
  r.get('/settings', COORDINATOR_UP, async (req, res) => {
    res.json(await settingsDto(ws(req)));
  });
  r.put('/settings', COORDINATOR_UP, validate({ body: ledgerSettingsBody }), async (req, res) => {
    const { version, ...values } = req.body as { region: string | null; nightWeight: number; weekendWeight: number; lookbackDays: number; version: number };
    assertRegion(values.region);
    const existing = await LedgerSettingsRow.findOne({ where: { workspaceId: ws(req) } });
    const stale = () => new HttpError(409, 'conflict', 'Someone changed these settings after you loaded them. Reload and try again.', [{ path: 'body.version', message: `you saw version ${version}` }]);
    if (!existing) {
      if (version !== 1) throw stale();
      try {
        await LedgerSettingsRow.create({ workspaceId: ws(req), ...values, version: 2 });
      } catch (err) {
        if (err instanceof UniqueConstraintError) throw stale();
        throw err;
      }
    } else {
      const [count] = await LedgerSettingsRow.update({ ...values, version: version + 1 }, { where: { workspaceId: ws(req), version } });
      if (count === 0) throw stale();
    }
    res.json(await settingsDto(ws(req)));
  });
  r.post('/holidays', COORDINATOR_UP, validate({ body: holidayBody }), async (req, res) => {
    try {
      await HolidayRow.create({ workspaceId: ws(req), date: req.body.date, name: req.body.name });
    } catch (err) {
      if (err instanceof UniqueConstraintError) throw new HttpError(409, 'conflict', `${req.body.date} is entered already.`, [{ path: 'body.date', message: 'already entered' }]);
      throw err;
    }
    res.status(201).json(await settingsDto(ws(req)));
  });
  r.delete('/holidays/:id', COORDINATOR_UP, validate({ params: idParams }), async (req, res) => {
    const count = await HolidayRow.destroy({ where: { id: Number(req.params.id), workspaceId: ws(req) } });
    if (!count) throw new HttpError(404, 'not_found', 'Holiday not found', [{ path: 'params.id', message: 'no such entered day' }]);
    res.status(204).end();
  });

  const mine = new ApiRoutes('/me');
  // A person's own line beside the team's per-person average: no one else's counts by name.
  mine.get('/ledger', STAFF_UP, validate({ query: ledgerQuery }), async (req, res) => {
    const person = await me(req);
    const all = await ledger(ws(req), req.query as { from?: string; to?: string });
    const own = all.people.find((p) => p.personId === person.id) ?? null;
    res.json({ from: all.from, to: all.to, periods: all.periods, holidays: all.holidays, me: own, teamSize: all.people.length, team: all.team });
  });
  return [r.router, mine.router] as const;
}
