import { fairShares, shiftFacts, weekendOf } from '../../shared/roster/derive';
import { addLocalDays } from '../../shared/roster/time';
import type { Roster as RosterJson, Term } from '../../shared/roster/schema';
import type { LedgerAnswer } from '../../shared/api/ledger';
import { parseRosterId } from '../rosters/ids';
import { ledgerSettings } from './holidays';
import { ledger } from './service';

type Earlier = LedgerAnswer['people'];
type Kind = 'nights' | 'weekendsWorked';

/**
 * How many more nights (or weekends) each person worked than their share over the look-back:
 * the team's total split in proportion to contracts (as fair shares are, shared/roster/derive.ts),
 * among the people the ledger counted. Whole units only, and only what is over: working fewer
 * earns nothing here, the roster's own fair rules already spread this period's.
 */
export function carriedExcess(earlier: Earlier): Record<Kind, Map<number, number>> {
  const out: Record<Kind, Map<number, number>> = { nights: new Map(), weekendsWorked: new Map() };
  const rows = earlier.filter((p) => p.totals.shifts > 0);
  const weights = rows.map((p) => p.totals.contractHours || p.totals.hours);
  const sum = weights.reduce((a, b) => a + b, 0);
  for (const kind of ['nights', 'weekendsWorked'] as const) {
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
 * This period's fair share in weekends rather than weekend shifts (what maxWeekends counts): the
 * weekend-shift share over the team's weekend shifts per weekend worked in the look-back, rounded
 * up as shares are and never more than the period's weekends. Without a look-back figure a
 * weekend is taken as one shift, which only ever makes the term looser.
 */
function weekendShares(roster: RosterJson, earlier: Earlier): Map<number, number> {
  const facts = shiftFacts(roster);
  const shifts = fairShares(roster, facts, (f) => f.weekend);
  const weekends = new Set(facts.filter((f) => f.weekend).map((f) => weekendOf(f.date))).size;
  const worked = earlier.reduce((a, p) => a + p.totals.weekendsWorked, 0);
  const perWeekend = worked > 0 ? Math.max(1, earlier.reduce((a, p) => a + p.totals.weekendShifts, 0) / worked) : 1;
  return new Map([...shifts].map(([i, share]) => [i, Math.min(weekends, Math.ceil(share / perWeekend - 1e-9))]));
}

/**
 * The look-back's excess as per-person soft terms of the next roster: someone who worked `k`
 * nights more than their share gets "at most (this period's fair share − k) nights" with the
 * ledger's night weight per night over (maxNights); weekends the same, in weekends (maxWeekends).
 * Terms are the roster format's own per-person factors, so the solver, scorer, explanations and
 * prices all read them without a new field.
 */
export function carriedTerms(roster: RosterJson, earlier: Earlier, settings: { nightWeight: number; weekendWeight: number }): Map<string, Term[]> {
  const out = new Map<string, Term[]>();
  const excess = carriedExcess(earlier);
  const nightShares = fairShares(roster, shiftFacts(roster), (f) => f.night);
  const weekends = excess.weekendsWorked.size ? weekendShares(roster, earlier) : new Map<number, number>();
  roster.people.forEach((p, i) => {
    const personId = parseRosterId('p', p.id);
    const terms: Term[] = [];
    const nights = excess.nights.get(personId);
    if (nights && settings.nightWeight > 0) terms.push({ kind: 'maxNights', count: Math.max(0, (nightShares.get(i) ?? 0) - nights), hard: false, weight: settings.nightWeight });
    const over = excess.weekendsWorked.get(personId);
    if (over && settings.weekendWeight > 0) terms.push({ kind: 'maxWeekends', count: Math.max(0, (weekends.get(i) ?? 0) - over), hard: false, weight: settings.weekendWeight });
    if (terms.length) out.set(p.id, terms);
  });
  return out;
}

/** carriedTerms for a roster of the workspace, from its ledger over the look-back before the period. */
export async function ledgerTerms(workspaceId: number, roster: RosterJson): Promise<Map<string, Term[]>> {
  const settings = await ledgerSettings(workspaceId);
  if (settings.nightWeight <= 0 && settings.weekendWeight <= 0) return new Map();
  const start = roster.period.start;
  const earlier = await ledger(workspaceId, { from: addLocalDays(start, -settings.lookbackDays), to: addLocalDays(start, -1) });
  return carriedTerms(roster, earlier.people, settings);
}
