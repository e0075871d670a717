import { afterEach, describe, expect, it, vi } from 'vitest';
import { dispositionFilename, fetchDownload } from '../../../components/rosters/download-link-fetch';

const json = (status: number, body: unknown) => new Response(JSON.stringify(body), { status, headers: { 'content-type': 'application/json' } });

/**
 * The download link's fetch against the API's two answers (server/exports/jobs.ts): 200 with the
 * file, or 202 Accepted whose Location is read until the export is done (RFC 9110 §15.3.3).
 * The server is a scripted fetch here; tests/server/exports/jobs.test.ts checks the real one.
 */
describe('fetchDownload', () => {
  afterEach(() => vi.unstubAllGlobals());

  it('a 200 is the file, named as Content-Disposition says (RFC 6266)', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => new Response('a,b\r\n', { status: 200, headers: { 'content-disposition': 'attachment; filename="late-roster.csv"' } })));
    const got = await fetchDownload('/api/rosters/1/roster.csv');
    expect(got.kind).toBe('file');
    expect(got.filename).toBe('late-roster.csv');
    if (got.kind === 'file') expect(await got.blob.text()).toBe('a,b\r\n');
  });

  it('a 202 says preparing, reads the status until done, and hands back the file address', async () => {
    const answers = [
      json(202, { location: '/api/exports/7', export: { status: 'queued', filename: null, error: null, fileUrl: '/api/exports/7/file' } }),
      json(200, { export: { status: 'running', filename: null, error: null, fileUrl: '/api/exports/7/file' } }),
      json(200, { export: { status: 'done', filename: 'long-roster.pdf', error: null, fileUrl: '/api/exports/7/file' } }),
    ];
    const fetchMock = vi.fn(async () => answers.shift()!);
    vi.stubGlobal('fetch', fetchMock);
    const onPreparing = vi.fn();
    const got = await fetchDownload('/api/rosters/1/roster.pdf', { onPreparing });
    expect(onPreparing).toHaveBeenCalledTimes(1);
    expect(got).toEqual({ kind: 'prepared', url: '/api/exports/7/file', filename: 'long-roster.pdf' });
    expect(fetchMock.mock.calls.map((c) => (c as unknown[])[0])).toEqual(['/api/rosters/1/roster.pdf', '/api/exports/7', '/api/exports/7']);
  });

  it('a failed job and a 503 come back in the server’s words', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => json(503, { error: { code: 'unavailable', message: 'No worker is running just now to prepare a file this large.' } })));
    await expect(fetchDownload('/x')).rejects.toThrow('No worker is running just now to prepare a file this large.');
    const answers = [
      json(202, { location: '/api/exports/8', export: { status: 'queued', filename: null, error: null, fileUrl: '/api/exports/8/file' } }),
      json(200, { export: { status: 'failed', filename: null, error: 'Run not found for this roster', fileUrl: '/api/exports/8/file' } }),
    ];
    vi.stubGlobal('fetch', vi.fn(async () => answers.shift()!));
    await expect(fetchDownload('/y')).rejects.toThrow('Run not found for this roster');
  });

  it('reads the quoted filename form only', () => {
    expect(dispositionFilename('attachment; filename="a b.ics"')).toBe('a b.ics');
    expect(dispositionFilename(null)).toBeNull();
  });
});
