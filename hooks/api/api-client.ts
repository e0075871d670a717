/** One field at fault, as the API reports it (`body.email`). */
export interface ApiFieldError {
  path: string;
  message: string;
}

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields: ApiFieldError[] = [],
  ) {
    super(message);
  }
  /** The message for one form field, matched on the last part of its path. */
  fieldMessage(name: string): string | undefined {
    return this.fields.find((f) => f.path === name || f.path.endsWith(`.${name}`))?.message;
  }
}

type ApiInit = { method?: string; body?: unknown; signal?: AbortSignal };

/** Same-origin JSON calls to `/api`, with the session cookie and errors turned into ApiError. */
export async function apiFetch<T>(path: string, init: ApiInit = {}): Promise<T> {
  return (await apiRequest<T>(path, init)).data;
}

/** apiFetch with the answer's headers, for the few callers that read one (the offline copy's date). */
export async function apiRequest<T>(path: string, init: ApiInit = {}): Promise<{ data: T; headers: Headers }> {
  let res: Response;
  try {
    res = await fetch(`/api${path}`, {
      method: init.method ?? 'GET',
      credentials: 'same-origin',
      // X-Rotaloom-CSRF: the server refuses state-changing calls without it (server/auth/csrf.ts).
      headers: init.body === undefined ? { accept: 'application/json', 'x-rotaloom-csrf': '1' } : { accept: 'application/json', 'content-type': 'application/json', 'x-rotaloom-csrf': '1' },
      body: init.body === undefined ? undefined : JSON.stringify(init.body),
      signal: init.signal,
    });
  } catch {
    throw new ApiError(0, 'network', 'Rotaloom could not be reached. Check your connection and try again.');
  }
  const text = await res.text();
  const data = text ? safeJson(text) : undefined;
  if (!res.ok) {
    const error = (data as { error?: { code?: string; message?: string; fields?: ApiFieldError[] } } | undefined)?.error;
    throw new ApiError(res.status, error?.code ?? 'unknown', error?.message ?? `The server answered ${res.status}`, error?.fields ?? []);
  }
  return { data: data as T, headers: res.headers };
}

function safeJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}
