import type { Request } from 'express';
import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { idParams } from '../../shared/api/paging';
import { holidayBody, ledgerQuery, ledgerSettingsBody } from '../../shared/api/ledger';
import { ledger } from './service';
import { addHoliday, removeHoliday, saveLedgerSettings, settingsDto } from './settings';

const ws = (req: Request) => req.auth!.workspaceId;

/** The fairness ledger, its holiday calendar and its weights (coordinators); staff see their own line (staff-router.ts). */
export function ledgerRouter() {
  const r = new ApiRoutes('/ledger');
  r.get('/', COORDINATOR_UP, validate({ query: ledgerQuery }), async (req, res) => {
    res.json(await ledger(ws(req), req.query as { from?: string; to?: string }));
  });
  r.get('/settings', COORDINATOR_UP, async (req, res) => {
    res.json(await settingsDto(ws(req)));
  });
  r.put('/settings', COORDINATOR_UP, validate({ body: ledgerSettingsBody }), async (req, res) => {
    await saveLedgerSettings(ws(req), req.body);
    res.json(await settingsDto(ws(req)));
  });
  r.post('/holidays', COORDINATOR_UP, validate({ body: holidayBody }), async (req, res) => {
    await addHoliday(ws(req), req.body);
    res.status(201).json(await settingsDto(ws(req)));
  });
  r.delete('/holidays/:id', COORDINATOR_UP, validate({ params: idParams }), async (req, res) => {
    await removeHoliday(ws(req), Number(req.params.id));
    res.status(204).end();
  });
  return r.router;
}
