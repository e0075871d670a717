import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { Concession } from './roster-types';
import { keys } from './query-keys';

/** The run's given-up soft constraints, largest cost first, numbered as the price endpoint expects. */
export const getConcessions = (runId: number) => apiFetch<{ items: Concession[] }>(`/runs/${runId}/concessions`).then((r) => r.items);

export const concessionsQueryOptions = (runId: number) => queryOptions({ queryKey: keys.runs.detail(runId)._ctx.concessions.queryKey, queryFn: () => getConcessions(runId) });

export const useConcessions = (runId: number) => useQuery(concessionsQueryOptions(runId));
