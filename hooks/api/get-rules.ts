import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { RuleSet } from './roster-types';
import { keys } from './query-keys';

export const getRules = (rosterId: number) => apiFetch<{ rules: RuleSet; version: number }>(`/rosters/${rosterId}/rules`);

export const rulesQueryOptions = (rosterId: number) => queryOptions({ queryKey: keys.rosters.detail(rosterId)._ctx.rules.queryKey, queryFn: () => getRules(rosterId) });

export const useRules = (rosterId: number) => useQuery(rulesQueryOptions(rosterId));
