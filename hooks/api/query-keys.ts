import { createQueryKeys, mergeQueryKeys } from '@lukemorales/query-key-factory';
import type { PeopleListQuery } from '@/shared/api/people';
import type { PairingStatus } from '@/shared/api/pairings';
import type { AbsencesFilter } from './get-absences';

/**
 * Every query's key, from one factory per resource. Query options take their key from here and
 * mutations invalidate through the same entries, so a key cannot drift between the two: `_def` is
 * a whole resource (`keys.rosters._def`), `detail(id)` one item with everything under it (its
 * `_ctx` queries), `list._def` every filter of a list.
 */
export const keys = mergeQueryKeys(
  createQueryKeys('session', { current: null }),
  createQueryKeys('auth', { providers: null, signUpPreview: (token: string) => [token] }),
  createQueryKeys('members', { list: null }),
  createQueryKeys('invitations', { list: null, preview: (token: string) => [token] }),
  // The plan and the invoices: a change of plan or seats changes both, so mutations invalidate `_def`.
  createQueryKeys('billing', { plan: null, invoices: null }),
  createQueryKeys('skills', { list: null }),
  createQueryKeys('people', {
    list: (query: PeopleListQuery) => [query],
    detail: (id: number) => ({ queryKey: [id], contextQueries: { terms: null } }),
  }),
  createQueryKeys('pairings', { list: (filter: { status?: PairingStatus; q?: string }) => [filter] }),
  createQueryKeys('rosters', {
    list: null,
    // A roster edit can change any of these, so mutations invalidate the whole detail(id).
    detail: (id: number) => ({
      queryKey: [id],
      contextQueries: {
        patterns: null,
        shifts: null,
        rules: null,
        pins: null,
        wishes: null,
        runs: null,
        suggestion: null,
        compare: (a: number, b: number) => [a, b],
        score: (assignment: Record<string, number | null>) => [assignment],
      },
    }),
  }),
  createQueryKeys('publishPreview', { of: (rosterId: number, runId: number) => [rosterId, runId] }),
  createQueryKeys('runs', {
    detail: (id: number) => ({ queryKey: [id], contextQueries: { concessions: null, seatAlternatives: (seatId: number) => [seatId] } }),
  }),
  createQueryKeys('swaps', { list: null }),
  createQueryKeys('offers', { roster: (rosterId: number) => [rosterId], openSeats: (rosterId: number) => [rosterId] }),
  createQueryKeys('ledger', { range: (from: string, to: string) => [from, to], settings: null }),
  createQueryKeys('absences', { list: (filter: AbsencesFilter) => [filter], settings: null, conflicts: null }),
  // The signed-in person's own answers; a swap or offer changes several, so they share `_def`.
  createQueryKeys('me', {
    shifts: (week: string) => [week],
    rosters: null,
    wishes: (rosterId: number) => [rosterId],
    colleagues: null,
    pairings: null,
    feed: null,
    absences: null,
    swaps: null,
    swapOptions: null,
    offers: null,
    ledger: (from: string, to: string) => [from, to],
  }),
);
