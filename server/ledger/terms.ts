import { fairShares, shiftFacts } from '../../shared/roster/derive';
import { addLocalDays } from '../../shared/roster/time';
import type { Roster as RosterJson, Term } from '../../shared/roster/schema';
import { parseRosterId } from '../rosters/ids';
import { ledgerSettings } from './holidays';
import { ledger } from './service';

type Kind = 'nights' | 'weekendShifts';

/**
 * How many more nights (or weekend shifts) each person worked than their share over the
 * ledger's look-back before `periodStart`: the team's total split in proportion to contracts
 * (as fair shares are, shared/roster/derive.ts), among the people the ledger counted. Whole
 * shifts only, and only what is over: working fewer earns nothing here, the roster's own fair
 * rules already spread this period's.
 */
export async function carriedExcess(workspaceId: number, periodStart: string, lookbackDays: number): Promise<Record<Kind, Map<number, number>>> {
  const earlier = await ledger(workspaceId, { from: addLocalDays(periodStart, -lookbackDays), to: addLocalDays(periodStart, -1) });
  const out: Record<Kind, Map<number, number>> = { nights: new Map(), weekendShifts: new Map() };
  const rows = earlier.people.filter((p) => p.totals.shifts > 0);
  const weights = rows.map((p) => p.totals.contractHours || p.totals.hours);
  const sum = weights.reduce((a, b) => a + b, 0);
  for (const kind of ['nights', 'weekendShifts'] as const) {
    const total = rows.reduce((a, p) => a + p.totals[kind], 0);
    rows.forEach((p, i) => {
      const share = sum > 0 ? (total * weights[i]) / sum : total / rows.length;
      const over = Math.floor(p.totals[kind] - share + 1e-9);
      if (over > 0) out[kind].set(p.personId, over);
    });
  }
  return out;
}

/**
 * The ledger as per-person soft terms of the next roster: someone who worked `k` nights more
 * than their share in the look-back gets "at most (this period's fair share − k) nights" with
 * the workspace's ledger weight per night over (maxNights; weekends the same with maxWeekends).
 * Terms are the roster format's own per-person factors, so the solver, scorer, explanations and
 * prices all read them without a new field.
 */
export async function ledgerTerms(workspaceId: number, roster: RosterJson): Promise<Map<string, Term[]>> {
  const settings = await ledgerSettings(workspaceId);
  const out = new Map<string, Term[]>();
  if (settings.nightWeight <= 0 && settings.weekendWeight <= 0) return out;
  const excess = await carriedExcess(workspaceId, roster.period.start, settings.lookbackDays);
  const facts = shiftFacts(roster);
  const shares = { nights: fairShares(roster, facts, (f) => f.night), weekendShifts: fairShares(roster, facts, (f) => f.weekend) };
  roster.people.forEach((p, i) => {
    const personId = parseRosterId('p', p.id);
    const terms: Term[] = [];
    const nights = excess.nights.get(personId);
    if (nights && settings.nightWeight > 0) terms.push({ kind: 'maxNights', count: Math.max(0, (shares.nights.get(i) ?? 0) - nights), hard: false, weight: settings.nightWeight });
    const weekends = excess.weekendShifts.get(personId);
    if (weekends && settings.weekendWeight > 0) terms.push({ kind: 'maxWeekends', count: Math.max(0, (shares.weekendShifts.get(i) ?? 0) - weekends), hard: false, weight: settings.weekendWeight });
    if (terms.length) out.set(p.id, terms);
  });
  return out;
}
