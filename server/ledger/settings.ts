import { UniqueConstraintError } from 'sequelize';
import { workspaceTimeZone } from '../workspaces/service';
import { HttpError } from '../http/errors';
import { HolidayRow, LedgerSettingsRow } from '../swaps/models';
import { addLocalDays } from '../../shared/roster/time';
import { localToday } from '../staff/shifts';
import type { LedgerSettingsDto } from '../../shared/api/ledger';
import { assertRegion, holidaysBetween, ledgerSettings } from './holidays';

/** The ledger's settings with the holiday calendar shown beside them. */
export async function settingsDto(workspaceId: number): Promise<LedgerSettingsDto> {
  const s = await ledgerSettings(workspaceId);
  const today = localToday(await workspaceTimeZone(workspaceId));
  // The calendar shown: the year before today to the year after, enough to plan and look back.
  const holidays = await holidaysBetween(workspaceId, addLocalDays(today, -366), addLocalDays(today, 366), s.region);
  return { region: s.region ?? null, nightWeight: s.nightWeight, weekendWeight: s.weekendWeight, lookbackDays: s.lookbackDays, version: s.version, holidays };
}

/**
 * Saves the settings the coordinator saw at `version`: the first save creates the row (a workspace
 * without one reads the defaults at version 1), later ones are conditional updates; a stale version is a 409.
 */
export async function saveLedgerSettings(workspaceId: number, body: { region: string | null; nightWeight: number; weekendWeight: number; lookbackDays: number; version: number }): Promise<void> {
  const { version, ...values } = body;
  assertRegion(values.region);
  const existing = await LedgerSettingsRow.findOne({ where: { workspaceId } });
  const stale = () => new HttpError(409, 'conflict', 'Someone changed these settings after you loaded them. Reload and try again.', [{ path: 'body.version', message: `you saw version ${version}` }]);
  if (!existing) {
    if (version !== 1) throw stale();
    try {
      await LedgerSettingsRow.create({ workspaceId, ...values, version: 2 });
    } catch (err) {
      if (err instanceof UniqueConstraintError) throw stale();
      throw err;
    }
  } else {
    const [count] = await LedgerSettingsRow.update({ ...values, version: version + 1 }, { where: { workspaceId, version } });
    if (count === 0) throw stale();
  }
}

/** An entered public holiday; a date entered already is a 409 naming `body.date`. */
export async function addHoliday(workspaceId: number, body: { date: string; name: string }): Promise<void> {
  try {
    await HolidayRow.create({ workspaceId, date: body.date, name: body.name });
  } catch (err) {
    if (err instanceof UniqueConstraintError) throw new HttpError(409, 'conflict', `${body.date} is entered already.`, [{ path: 'body.date', message: 'already entered' }]);
    throw err;
  }
}

export async function removeHoliday(workspaceId: number, id: number): Promise<void> {
  const count = await HolidayRow.destroy({ where: { id, workspaceId } });
  if (!count) throw new HttpError(404, 'not_found', 'Holiday not found', [{ path: 'params.id', message: 'no such entered day' }]);
}
