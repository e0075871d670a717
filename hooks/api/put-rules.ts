import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { RuleSet } from './roster-types';
import { keys } from './query-keys';

export const putRules = ({ rosterId, rules, version }: { rosterId: number; rules: RuleSet; version: number }) =>
  apiFetch<{ rules: RuleSet; version: number }>(`/rosters/${rosterId}/rules`, { method: 'PUT', body: { rules, version } });

export function usePutRules() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: putRules, onSuccess: (_d, v) => queryClient.invalidateQueries({ queryKey: keys.rosters.detail(v.rosterId).queryKey }) });
}
