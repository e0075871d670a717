/**
 * Fetches an export the way the API answers it (server/exports/jobs.ts): a small file comes back
 * at once (200); a large one is made by a worker, so the answer is 202 with the export's status
 * address, read here until the file is ready. Errors come back in the server's words.
 */

export type DownloadResult = { kind: 'file'; blob: Blob; filename: string | null } | { kind: 'prepared'; url: string; filename: string | null };

interface ExportStatus {
  status: 'queued' | 'running' | 'done' | 'failed';
  filename: string | null;
  error: string | null;
  fileUrl: string;
}

const wait = (ms: number, signal?: AbortSignal) =>
  new Promise<void>((resolve, reject) => {
    const t = setTimeout(resolve, ms);
    signal?.addEventListener('abort', () => {
      clearTimeout(t);
      reject(new DOMException('aborted', 'AbortError'));
    });
  });

async function errorWords(res: Response): Promise<string> {
  try {
    const body = (await res.json()) as { error?: { message?: string } };
    if (body.error?.message) return body.error.message;
  } catch {
    // not JSON: fall through to the status
  }
  return `The file could not be downloaded (the server answered ${res.status}).`;
}

/** The filename of a Content-Disposition header (RFC 6266 §4.1, the quoted form the API sends). */
export function dispositionFilename(header: string | null): string | null {
  const m = /filename="([^"]*)"/i.exec(header ?? '');
  return m ? m[1] : null;
}

/** How long to wait before reading the status again: quick at first, then every two seconds. */
export const pollDelay = (attempt: number) => Math.min(2000, 400 + attempt * 200);

/** At most this long in all: the worker's retry included, a file is made long before. */
const GIVE_UP_MS = 10 * 60_000;

export async function fetchDownload(href: string, opts: { onPreparing?: () => void; signal?: AbortSignal } = {}): Promise<DownloadResult> {
  const get = (url: string) => fetch(url, { credentials: 'same-origin', headers: { accept: 'application/json, */*' }, signal: opts.signal }).catch(() => {
    throw new Error('Rotaloom could not be reached. Check your connection and try again.');
  });
  const res = await get(href);
  if (res.status === 200) return { kind: 'file', blob: await res.blob(), filename: dispositionFilename(res.headers.get('content-disposition')) };
  if (res.status !== 202) throw new Error(await errorWords(res));
  const accepted = (await res.json()) as { location: string; export: ExportStatus };
  opts.onPreparing?.();
  const started = Date.now();
  let status = accepted.export;
  for (let attempt = 0; status.status === 'queued' || status.status === 'running'; attempt++) {
    if (Date.now() - started > GIVE_UP_MS) throw new Error('The file is taking far longer than it should. Try again later.');
    await wait(pollDelay(attempt), opts.signal);
    const next = await get(accepted.location);
    if (!next.ok) throw new Error(await errorWords(next));
    status = ((await next.json()) as { export: ExportStatus }).export;
  }
  if (status.status === 'failed') throw new Error(status.error ?? 'The file could not be prepared.');
  return { kind: 'prepared', url: status.fileUrl, filename: status.filename };
}
