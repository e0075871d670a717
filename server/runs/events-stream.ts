import type { Request, RequestHandler, Response } from 'express';
import { HttpError, notFound } from '../http/errors';
import { RunRow } from '../rosters/models';
import { watchRun, type RunSignal } from '../queue/run-events';
import { FINAL_STATUSES } from './result-cache';

/** How long the browser waits before it reconnects a stream that broke (the `retry:` field). */
const RETRY_MS = 2000;
/** The row is read again this often whatever the events say: a missed event (Redis away a moment) costs at most this long. */
const REREAD_MS = 5000;
/** A stream ends after this long and the browser reconnects, so no connection outlives a deploy by much. */
const MAX_STREAM_MS = 10 * 60_000;

/**
 * `GET /api/runs/:id/events`: server-sent events (text/event-stream) for one run, fed by BullMQ's
 * queue events. `run` carries the run as `GET /api/runs/:id` does, without its roster, whenever it
 * changes (first at once); `progress` carries the solver's progress as the worker reports it.
 * The stream ends after a run event with a final status. MariaDB stays the source of truth: an
 * event only says when to read the row, except progress, which is what the worker also wrote there.
 */
export function runEventStream(view: (run: RunRow) => Promise<Record<string, unknown>>): RequestHandler {
  return async (req: Request, res: Response) => {
    const where = { id: Number(req.params.id), workspaceId: req.auth!.workspaceId };
    const first = await RunRow.findOne({ where, attributes: { exclude: ['result'] } });
    if (!first) throw notFound('Run');
    // Another workspace's id is a 404 first, as everywhere. Then: only for clients that say they
    // read streams (EventSource always sends this Accept, WHATWG HTML §9.2.4); anything else would
    // wait for an answer that, for an unfinished run, does not end.
    if (!/\btext\/event-stream\b/i.test(req.get('accept') ?? '')) {
      throw new HttpError(406, 'bad_request', 'This address answers with a stream of server-sent events; ask for text/event-stream, or read GET /api/runs/:id.', [{ path: 'headers.accept', message: 'must include text/event-stream' }]);
    }
    // no-transform keeps compression (server/app.ts) from buffering the stream; X-Accel-Buffering does the same for nginx.
    res.status(200).set({ 'Content-Type': 'text/event-stream; charset=utf-8', 'Cache-Control': 'no-cache, no-transform', 'X-Accel-Buffering': 'no' });
    res.flushHeaders();
    res.write(`retry: ${RETRY_MS}\n\n`);

    let ended = false;
    let lastRun = '';
    let stopWatching: (() => void) | null = null;
    let pollTimer: ReturnType<typeof setTimeout> | undefined;
    let lifeTimer: ReturnType<typeof setTimeout> | undefined;
    const end = () => {
      if (ended) return;
      ended = true;
      stopWatching?.();
      clearTimeout(pollTimer);
      clearTimeout(lifeTimer);
      res.end();
    };
    req.on('close', end);
    const write = (event: string, json: string) => {
      if (!ended) res.write(`event: ${event}\ndata: ${json}\n\n`);
    };
    const sendRow = async (row: RunRow | null) => {
      if (ended) return;
      if (!row) {
        // Deleted with its roster while watched.
        write('gone', JSON.stringify({ id: where.id, message: 'This run was deleted with its roster.' }));
        return end();
      }
      const json = JSON.stringify(await view(row));
      if (json !== lastRun) write('run', json);
      lastRun = json;
      if (FINAL_STATUSES.has(row.status)) end();
    };
    // One read at a time, in order, so an older read never overwrites a newer one on the wire.
    let reading: Promise<void> = Promise.resolve();
    const reread = () => {
      reading = reading.then(() => RunRow.findOne({ where, attributes: { exclude: ['result'] } }).then(sendRow)).catch(() => {});
      return reading;
    };

    // The headers are out: from here a failure ends the stream (the browser reconnects) rather than reaching the JSON error handler.
    await sendRow(first).catch(end);
    if (ended) return;
    const onSignal = (signal: RunSignal) => {
      if (signal.type === 'progress') {
        const p = signal.progress;
        return write('progress', JSON.stringify({ id: where.id, status: 'running', progress: p, score: p.score ?? null, bound: p.bound ?? null, gap: p.gap ?? null }));
      }
      void reread();
    };
    stopWatching = await watchRun(RunRow.sequelize!, where.id, onSignal).catch(() => null);
    if (ended) return stopWatching?.();
    // Whatever happened between the first read and listening; then a look now and then, with a
    // comment line that keeps proxies from closing a quiet stream.
    void reread();
    const poll = () => {
      pollTimer = setTimeout(() => {
        if (!ended) res.write(':\n\n');
        void reread().then(() => !ended && poll());
      }, REREAD_MS);
    };
    poll();
    lifeTimer = setTimeout(end, MAX_STREAM_MS);
  };
}
