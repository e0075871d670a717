import { queryOptions, useQuery, keepPreviousData } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { ScoreResult } from './roster-types';
import { keys } from './query-keys';

/** The independent scorer on a hand-edited roster (seat id → person id or null). */
export const scoreRoster = (rosterId: number, assignment: Record<string, number | null>) =>
  apiFetch<ScoreResult>(`/rosters/${rosterId}/score`, { method: 'POST', body: { assignment } });

/** A read despite the POST: keyed by the edited roster, so every edit re-scores live and repeats come from the cache. */
export const rosterScoreQueryOptions = (rosterId: number, assignment: Record<string, number | null>) =>
  queryOptions({ queryKey: keys.rosters.detail(rosterId)._ctx.score(assignment).queryKey, queryFn: () => scoreRoster(rosterId, assignment), placeholderData: keepPreviousData, staleTime: Infinity });

export const useRosterScore = (rosterId: number, assignment: Record<string, number | null> | null) =>
  useQuery({ ...rosterScoreQueryOptions(rosterId, assignment ?? {}), enabled: assignment !== null });
