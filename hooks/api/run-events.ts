import { useEffect } from 'react';
import { useQueryClient, type QueryClient } from '@tanstack/react-query';
import type { RunDetail } from './roster-types';
import { keys } from './query-keys';

type RunPatch = Partial<RunDetail> & { id: number; status?: RunDetail['status'] };

interface Stream {
  source: EventSource;
  users: number;
  live: boolean;
  listeners: Set<(live: boolean) => void>;
}

/**
 * One EventSource per run, however many parts of the screen show it: over HTTP/1.1 a browser
 * keeps at most six connections to one site, and each stream holds one open.
 */
const streams = new Map<number, Stream>();

const FINAL = new Set(['done', 'failed', 'cancelled']);

/** Server-sent events exist in browsers; React Native has no EventSource, so the app polls there. */
export const canStreamRuns = () => typeof EventSource !== 'undefined';

function open(id: number, queryClient: QueryClient): Stream {
  const key = keys.runs.detail(id).queryKey;
  const source = new EventSource(`/api/runs/${id}/events`, { withCredentials: true });
  const stream: Stream = { source, users: 0, live: false, listeners: new Set() };
  const setLive = (live: boolean) => {
    if (stream.live === live) return;
    stream.live = live;
    stream.listeners.forEach((l) => l(live));
  };
  const merge = (patch: RunPatch) => {
    if (!queryClient.getQueryData(key)) return void queryClient.invalidateQueries({ queryKey: key });
    queryClient.setQueryData<RunDetail>(key, (old) => (old ? { ...old, ...patch } : old));
  };
  const finish = () => {
    // Closed before the server ends the stream, so the browser does not reconnect to a finished run.
    source.close();
    streams.delete(id);
    setLive(false);
    // The finished run's roster (assignments) and result come with the full read.
    void queryClient.invalidateQueries({ queryKey: key });
  };
  source.onopen = () => setLive(true);
  source.addEventListener('run', (e) => {
    const run = JSON.parse((e as MessageEvent<string>).data) as RunPatch;
    if (run.status && FINAL.has(run.status)) return finish();
    merge(run);
  });
  source.addEventListener('progress', (e) => merge(JSON.parse((e as MessageEvent<string>).data) as RunPatch));
  source.addEventListener('gone', finish);
  source.onerror = () => {
    // CONNECTING: the browser tries again by itself; meanwhile polling carries on. CLOSED: it gave up.
    setLive(false);
    if (source.readyState === EventSource.CLOSED) streams.delete(id);
  };
  streams.set(id, stream);
  return stream;
}

/**
 * Follows an unfinished run through `GET /api/runs/:id/events` and writes what it hears into the
 * run's query data. `onLive` hears whether the stream is up: while it is not (no EventSource, a
 * proxy that cuts streams, the server restarting), the caller keeps polling.
 */
export function useRunEvents(id: number | null, unfinished: boolean, onLive: (live: boolean) => void): void {
  const queryClient = useQueryClient();
  useEffect(() => {
    if (id === null || !unfinished || !canStreamRuns()) return;
    const stream = streams.get(id) ?? open(id, queryClient);
    stream.users++;
    stream.listeners.add(onLive);
    onLive(stream.live);
    return () => {
      stream.listeners.delete(onLive);
      onLive(false);
      if (--stream.users > 0) return;
      stream.source.close();
      if (streams.get(id) === stream) streams.delete(id);
    };
  }, [id, unfinished, queryClient, onLive]);
}
