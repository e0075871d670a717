import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import type { Express } from 'express';
import { demoSetup } from './demo';
import { PASSWORD, makeUser, makeWorkspace } from '../auth/helpers';
import type { TestDb } from '../helpers/test-db';
import type { Workspace } from '../../../server/db/models';
import { Roster } from '../../../server/rosters/models';
import type { RunWorker } from '../../../server/runs/worker';

interface StreamEvent {
  event: string;
  data: unknown;
  at: number;
}

/**
 * Reads a text/event-stream body as the WHATWG HTML standard says (§9.2.6 "Interpreting an event
 * stream"): lines end in CRLF, LF or CR; a blank line dispatches the event; lines starting with a
 * colon are comments; "field: value" loses one space after the colon; data lines are joined by LF;
 * the event type defaults to "message".
 */
async function readStream(body: ReadableStream<Uint8Array>, onEvent: (e: StreamEvent) => void): Promise<void> {
  const decoder = new TextDecoder();
  let buffer = '';
  let type = '';
  let data: string[] = [];
  const line = (l: string) => {
    if (l === '') {
      if (data.length) onEvent({ event: type || 'message', data: JSON.parse(data.join('\n')), at: Date.now() });
      type = '';
      data = [];
      return;
    }
    if (l.startsWith(':')) return;
    const colon = l.indexOf(':');
    const field = colon < 0 ? l : l.slice(0, colon);
    let value = colon < 0 ? '' : l.slice(colon + 1);
    if (value.startsWith(' ')) value = value.slice(1);
    if (field === 'event') type = value;
    else if (field === 'data') data.push(value);
  };
  for await (const chunk of body as unknown as AsyncIterable<Uint8Array>) {
    buffer += decoder.decode(chunk, { stream: true });
    const parts = buffer.split(/\r\n|\r|\n/);
    buffer = parts.pop()!;
    parts.forEach(line);
  }
}

/** Live progress of a run over server-sent events, fed by BullMQ's queue events, on the Willowmere demo (it does not finish early). */
describe('GET /api/runs/:id/events: live progress as server-sent events', () => {
  let db: TestDb;
  let worker: RunWorker;
  let server: Server;
  let base: string;
  let cookie: string;
  let rosterId: number;

  const call = async (method: string, path: string, body?: unknown) => {
    const res = await fetch(`${base}${path}`, { method, headers: { cookie, 'content-type': 'application/json', 'x-rotaloom-csrf': '1' }, body: body === undefined ? undefined : JSON.stringify(body) });
    return { status: res.status, body: (await res.json()) as any };
  };
  const open = async (runId: number, as = cookie) => {
    const res = await fetch(`${base}/api/runs/${runId}/events`, { headers: { cookie: as, accept: 'text/event-stream' } });
    const events: StreamEvent[] = [];
    const done = res.ok ? readStream(res.body!, (e) => events.push(e)) : Promise.resolve();
    return { res, events, done };
  };

  beforeAll(async () => {
    let workspace: Workspace;
    let app: Express;
    ({ db, app, workspace, worker } = await demoSetup('events-worker'));
    rosterId = (await Roster.findOne({ where: { workspaceId: workspace.id } }))!.id;
    server = app.listen(0, '127.0.0.1');
    await new Promise((r) => server.once('listening', r));
    base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
    cookie = await signIn(workspace);
  });
  const signIn = async (workspace: Workspace) => {
    const user = await makeUser({ workspace, role: 'coordinator' });
    const res = await fetch(`${base}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json', 'x-rotaloom-csrf': '1' }, body: JSON.stringify({ email: user.email, password: PASSWORD }) });
    expect(res.status).toBe(200);
    return res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
  };
  afterAll(async () => {
    await worker.stop();
    await new Promise((r) => server.close(r));
    await db.drop();
  });

  it('streams the queued run, its start, the solver’s progress and the finished run, then ends', { timeout: 120_000 }, async () => {
    const start = await call('POST', `/api/rosters/${rosterId}/runs`, { timeLimitSeconds: 4, seed: 7 });
    expect(start.status).toBe(202);
    const stream = await open(start.body.id);
    expect(stream.res.status).toBe(200);
    expect(stream.res.headers.get('content-type')).toMatch(/^text\/event-stream/);
    expect(stream.res.headers.get('content-encoding')).toBeNull();
    worker.start();
    await stream.done; // the server ends the stream after the final state
    const kinds = stream.events.map((e) => e.event);
    expect(kinds[0]).toBe('run');
    expect((stream.events[0].data as { status: string }).status).toBe('queued');
    const runs = stream.events.filter((e) => e.event === 'run').map((e) => e.data as { status: string; score: number | null });
    expect(runs.map((r) => r.status)).toContain('running');
    const progress = stream.events.filter((e) => e.event === 'progress');
    expect(progress.length).toBeGreaterThanOrEqual(1);
    for (const p of progress) expect((p.data as { status: string }).status).toBe('running');
    // Heard while it solved, not in a burst at the end: before the final event, by more than the marginals' second.
    const final = stream.events.at(-1)!;
    expect(final.event).toBe('run');
    expect(final.at - progress[0].at).toBeGreaterThan(500);
    const last = runs.at(-1)!;
    // The worker sends one report to both the queue (this stream) and the row (what polling reads).
    const polled = await call('GET', `/api/runs/${start.body.id}`);
    expect((progress.at(-1)!.data as { progress: unknown }).progress).toEqual(polled.body.progress);
    expect(last).toMatchObject({ status: 'done', score: polled.body.score });
  });

  it('a cancel during the stream ends it with the cancelled run; a finished run gets one event; another workspace’s run is a 404', { timeout: 120_000 }, async () => {
    const start = await call('POST', `/api/rosters/${rosterId}/runs`, { timeLimitSeconds: 30, seed: 8 });
    const stream = await open(start.body.id);
    const t = Date.now();
    while (!stream.events.some((e) => e.event === 'progress')) {
      if (Date.now() - t > 60_000) throw new Error('no progress within 60 s');
      await new Promise((r) => setTimeout(r, 100));
    }
    expect((await call('POST', `/api/runs/${start.body.id}/cancel`, {})).status).toBe(202);
    await stream.done;
    expect((stream.events.at(-1)!.data as { status: string }).status).toBe('cancelled');

    const again = await open(start.body.id);
    await again.done;
    expect(again.events.map((e) => e.event)).toEqual(['run']);

    // A client that does not ask for a stream gets a plain error, not an answer that never ends.
    const plain = await fetch(`${base}/api/runs/${start.body.id}/events`, { headers: { cookie } });
    expect(plain.status).toBe(406);
    expect(((await plain.json()) as { error: { fields: Array<{ path: string }> } }).error.fields[0].path).toBe('headers.accept');

    const outsider = await signIn(await makeWorkspace('Thistle Row'));
    const theirs = await open(start.body.id, outsider);
    expect(theirs.res.status).toBe(404);
    expect(theirs.res.headers.get('content-type')).toMatch(/application\/json/);
    expect(((await theirs.res.json()) as { error: { code: string } }).error.code).toBe('not_found');
  });
});
