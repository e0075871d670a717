// What each invalidation refreshes, written out here as lists of query names, checked with
// TanStack Query's own key matching (QueryCache.findAll, prefix match) over a cache holding one
// entry per query options object of hooks/api.
import { describe, expect, it } from 'vitest';
import { QueryClient } from '@tanstack/react-query';
import { keys } from '../../hooks/api/query-keys';
import { rosterQueryOptions } from '../../hooks/api/get-roster';
import { rostersQueryOptions } from '../../hooks/api/get-rosters';
import { shiftsQueryOptions } from '../../hooks/api/get-shifts';
import { rulesQueryOptions } from '../../hooks/api/get-rules';
import { pinsQueryOptions } from '../../hooks/api/get-pins';
import { patternsQueryOptions } from '../../hooks/api/get-patterns';
import { rosterWishesQueryOptions } from '../../hooks/api/get-roster-wishes';
import { runsQueryOptions } from '../../hooks/api/get-runs';
import { suggestionQueryOptions } from '../../hooks/api/get-suggestion';
import { runCompareQueryOptions } from '../../hooks/api/get-run-compare';
import { rosterScoreQueryOptions } from '../../hooks/api/score-roster';
import { publishPreviewQueryOptions } from '../../hooks/api/get-publish-preview';
import { runQueryOptions } from '../../hooks/api/get-run';
import { concessionsQueryOptions } from '../../hooks/api/get-concessions';
import { seatAlternativesQueryOptions } from '../../hooks/api/get-seat-alternatives';
import { peopleQueryOptions } from '../../hooks/api/get-people';
import { personQueryOptions } from '../../hooks/api/get-person';
import { termsQueryOptions } from '../../hooks/api/get-terms';
import { skillsQueryOptions } from '../../hooks/api/get-skills';
import { pairingsQueryOptions } from '../../hooks/api/get-pairings';
import { billingQueryOptions } from '../../hooks/api/get-billing';
import { invoicesQueryOptions } from '../../hooks/api/get-invoices';
import { ledgerQueryOptions } from '../../hooks/api/get-ledger';
import { ledgerSettingsQueryOptions } from '../../hooks/api/get-ledger-settings';
import { absencesQueryOptions } from '../../hooks/api/get-absences';
import { absenceConflictsQueryOptions } from '../../hooks/api/get-absence-conflicts';
import { myShiftsQueryOptions } from '../../hooks/api/get-my-shifts';
import { myWishesQueryOptions } from '../../hooks/api/get-my-wishes';
import { myLedgerQueryOptions } from '../../hooks/api/get-my-ledger';
import { swapsQueryOptions } from '../../hooks/api/get-swaps';
import { rosterOffersQueryOptions } from '../../hooks/api/get-roster-offers';
import { sessionQueryOptions } from '../../hooks/api/get-session';

const QUERIES = {
  'roster 3': rosterQueryOptions(3),
  'roster 4': rosterQueryOptions(4),
  'roster list': rostersQueryOptions(),
  'roster 3 shifts': shiftsQueryOptions(3),
  'roster 3 rules': rulesQueryOptions(3),
  'roster 3 pins': pinsQueryOptions(3),
  'roster 3 patterns': patternsQueryOptions(3),
  'roster 3 wishes': rosterWishesQueryOptions(3),
  'roster 3 runs': runsQueryOptions(3),
  'roster 4 runs': runsQueryOptions(4),
  'roster 3 suggestion': suggestionQueryOptions(3),
  'roster 3 compare': runCompareQueryOptions(3, 10, 11),
  'roster 3 score': rosterScoreQueryOptions(3, { st1: 2 }),
  'publish preview 3/10': publishPreviewQueryOptions(3, 10),
  'run 10': runQueryOptions(10),
  'run 11': runQueryOptions(11),
  'run 10 concessions': concessionsQueryOptions(10),
  'run 10 seat 5': seatAlternativesQueryOptions(10, 5),
  'people list': peopleQueryOptions({ q: 'ann' }),
  'person 7': personQueryOptions(7),
  'person 7 terms': termsQueryOptions(7),
  skills: skillsQueryOptions(),
  pairings: pairingsQueryOptions({ status: 'approved' }),
  billing: billingQueryOptions(),
  invoices: invoicesQueryOptions(),
  ledger: ledgerQueryOptions({ from: '2027-01-01' }),
  'ledger settings': ledgerSettingsQueryOptions(),
  absences: absencesQueryOptions({ status: 'approved' }),
  'absence conflicts': absenceConflictsQueryOptions(),
  'my shifts': myShiftsQueryOptions(),
  'my wishes 3': myWishesQueryOptions(3),
  'my ledger': myLedgerQueryOptions(),
  swaps: swapsQueryOptions(),
  'roster 3 offers': rosterOffersQueryOptions(3),
  session: sessionQueryOptions(),
} as const;
type Name = keyof typeof QUERIES;

/** What each invalidation the mutations make must refresh, and nothing else. */
const REFRESHES: Array<[string, readonly unknown[], Name[]]> = [
  // a shift, pattern, pin, rule or wish edit: everything under that roster, not another roster's
  ['one roster', keys.rosters.detail(3).queryKey, ['roster 3', 'roster 3 shifts', 'roster 3 rules', 'roster 3 pins', 'roster 3 patterns', 'roster 3 wishes', 'roster 3 runs', 'roster 3 suggestion', 'roster 3 compare', 'roster 3 score']],
  // publish, reopen, a finished run: every roster read, but not the publish preview (asked afresh each time)
  ['all rosters', keys.rosters._def, ['roster 3', 'roster 4', 'roster list', 'roster 3 shifts', 'roster 3 rules', 'roster 3 pins', 'roster 3 patterns', 'roster 3 wishes', 'roster 3 runs', 'roster 4 runs', 'roster 3 suggestion', 'roster 3 compare', 'roster 3 score']],
  ['roster list', keys.rosters.list.queryKey, ['roster list']],
  ['a roster runs', keys.rosters.detail(3)._ctx.runs.queryKey, ['roster 3 runs']],
  ['one run', keys.runs.detail(10).queryKey, ['run 10', 'run 10 concessions', 'run 10 seat 5']],
  ['all runs', keys.runs._def, ['run 10', 'run 11', 'run 10 concessions', 'run 10 seat 5']],
  ['people', keys.people._def, ['people list', 'person 7', 'person 7 terms']],
  ['people lists', keys.people.list._def, ['people list']],
  ['a person terms', keys.people.detail(7)._ctx.terms.queryKey, ['person 7 terms']],
  ['billing', keys.billing._def, ['billing', 'invoices']],
  ['ledger', keys.ledger._def, ['ledger', 'ledger settings']],
  ['absence lists', keys.absences.list._def, ['absences']],
  ['my answers', keys.me._def, ['my shifts', 'my wishes 3', 'my ledger']],
  ['my wishes', keys.me.wishes(3).queryKey, ['my wishes 3']],
  ['offers', keys.offers._def, ['roster 3 offers']],
  ['session', keys.session._def, ['session']],
];

describe('query keys: what each invalidation refreshes', () => {
  const client = new QueryClient();
  for (const [name, options] of Object.entries(QUERIES)) client.setQueryData(options.queryKey as readonly unknown[], name);
  const nameOf = new Map(client.getQueryCache().getAll().map((q) => [q.queryHash, q.state.data as Name]));

  it('gives every query its own key', () => {
    expect(nameOf.size).toBe(Object.keys(QUERIES).length);
  });

  it.each(REFRESHES)('%s', (_label, queryKey, expected) => {
    const matched = client.getQueryCache().findAll({ queryKey }).map((q) => nameOf.get(q.queryHash));
    expect(matched.sort()).toEqual([...expected].sort());
  });
});
