import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { RunDetail } from './roster-types';

export const getRun = (id: number) => apiFetch<RunDetail>(`/runs/${id}`);

const unfinished = (status?: string) => status === 'queued' || status === 'running';

/** Polls twice a second while the run is queued or running (progress, score, bound, gap), then stops. */
export const runQueryOptions = (id: number) =>
  queryOptions({
    queryKey: ['runs', id],
    queryFn: () => getRun(id),
    refetchInterval: (query) => (unfinished(query.state.data?.status) ? 500 : false),
  });

export const useRun = (id: number | null) => useQuery({ ...runQueryOptions(id ?? 0), enabled: id !== null });
