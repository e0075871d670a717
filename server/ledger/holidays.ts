import Holidays from 'date-holidays';
import { Op } from 'sequelize';
import { HttpError } from '../http/errors';
import { HolidayRow, LedgerSettingsRow } from '../swaps/models';

export type Holiday = { date: string; name: string; source: 'entered' | 'region'; id?: number };

/** The date-holidays calendar for "GB-ENG" (country, then region), or null when it has none. */
export function regionCalendar(region: string): Holidays | null {
  const [country, state] = region.split('-');
  const hd = new Holidays();
  if (!hd.getCountries()[country]) return null;
  if (state && !(hd.getStates(country) ?? {})[state.toUpperCase()]) return null;
  return state ? new Holidays(country, state.toUpperCase()) : new Holidays(country);
}

export function assertRegion(region: string | null): void {
  if (region && !regionCalendar(region)) throw new HttpError(422, 'unprocessable', `date-holidays knows no region "${region}".`, [{ path: 'body.region', message: 'unknown country or region' }]);
}

export async function ledgerSettings(workspaceId: number): Promise<LedgerSettingsRow> {
  const row = await LedgerSettingsRow.findOne({ where: { workspaceId } });
  return row ?? LedgerSettingsRow.build({ workspaceId, region: null, nightWeight: 3, weekendWeight: 3, lookbackDays: 91, version: 1 });
}

/**
 * Public holidays from `from` to `to` (inclusive): the days the coordinator entered, and the
 * public ones of the chosen region (date-holidays, type "public"). An entered day wins its date.
 */
export async function holidaysBetween(workspaceId: number, from: string, to: string, region?: string | null): Promise<Holiday[]> {
  const entered = await HolidayRow.findAll({ where: { workspaceId, date: { [Op.between]: [from, to] } }, order: [['date', 'ASC']] });
  const byDate = new Map<string, Holiday>();
  const chosen = region === undefined ? (await ledgerSettings(workspaceId)).region : region;
  const hd = chosen ? regionCalendar(chosen) : null;
  if (hd) {
    for (let y = Number(from.slice(0, 4)); y <= Number(to.slice(0, 4)); y++) {
      for (const h of hd.getHolidays(y) || []) {
        const date = h.date.slice(0, 10);
        if (h.type === 'public' && date >= from && date <= to && !byDate.has(date)) byDate.set(date, { date, name: h.name, source: 'region' });
      }
    }
  }
  for (const h of entered) byDate.set(h.date, { date: h.date, name: h.name, source: 'entered', id: h.id });
  return [...byDate.values()].sort((a, b) => a.date.localeCompare(b.date));
}
