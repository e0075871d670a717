import { useState } from 'react';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { RunDetail } from './roster-types';
import { useRunEvents } from './run-events';
import { keys } from './query-keys';

export const getRun = (id: number) => apiFetch<RunDetail>(`/runs/${id}`);

const unfinished = (status?: string) => status === 'queued' || status === 'running';

/** Polls twice a second while the run is queued or running (progress, score, bound, gap), then stops. */
export const runQueryOptions = (id: number) =>
  queryOptions({
    queryKey: keys.runs.detail(id).queryKey,
    queryFn: () => getRun(id),
    refetchInterval: (query) => (unfinished(query.state.data?.status) ? 500 : false),
  });

/**
 * While the run's event stream is up (server-sent events, hooks/api/run-events.ts), it brings
 * progress as the worker reports it and polling slows to a rare check; without it, the poll above.
 */
export function useRun(id: number | null) {
  const [live, setLive] = useState(false);
  const query = useQuery({
    ...runQueryOptions(id ?? 0),
    enabled: id !== null,
    refetchInterval: (q) => (unfinished(q.state.data?.status) ? (live ? 15_000 : 500) : false),
  });
  useRunEvents(id, unfinished(query.data?.status), setLive);
  return query;
}
