import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ImportReport } from '@/shared/api/people';
import { ApiError, type ApiFieldError } from './api-client';
import { keys } from './query-keys';

export type { ImportReport };

/**
 * Sends a CSV file as multipart/form-data (field "file") to the preview or the commit step.
 * apiFetch speaks JSON only; this adds the same CSRF header and turns errors into ApiError.
 */
export async function uploadPeopleCsv(step: 'preview' | 'commit', file: Blob & { name?: string }, signal?: AbortSignal): Promise<ImportReport> {
  const form = new FormData();
  form.append('file', file, file.name ?? 'people.csv');
  let res: Response;
  try {
    res = await fetch(`/api/people/import/${step}`, { method: 'POST', credentials: 'same-origin', headers: { accept: 'application/json', 'x-rotaloom-csrf': '1' }, body: form, signal });
  } catch {
    if (signal?.aborted) throw new ApiError(0, 'cancelled', 'The upload was cancelled; nothing was imported.');
    throw new ApiError(0, 'network', 'Rotaloom could not be reached. Check your connection and try again.');
  }
  const text = await res.text();
  let data: unknown;
  try {
    data = text ? JSON.parse(text) : undefined;
  } catch {
    data = undefined;
  }
  if (!res.ok) {
    const error = (data as { error?: { code?: string; message?: string; fields?: ApiFieldError[] } } | undefined)?.error;
    throw new ApiError(res.status, error?.code ?? 'unknown', error?.message ?? `The server answered ${res.status}`, error?.fields ?? []);
  }
  return data as ImportReport;
}

export const usePreviewPeopleImport = () => useMutation({ mutationFn: ({ file, signal }: { file: Blob & { name?: string }; signal?: AbortSignal }) => uploadPeopleCsv('preview', file, signal) });

export function useCommitPeopleImport() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ file, signal }: { file: Blob & { name?: string }; signal?: AbortSignal }) => uploadPeopleCsv('commit', file, signal),
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: keys.people._def });
      void queryClient.invalidateQueries({ queryKey: keys.skills._def });
    },
  });
}
