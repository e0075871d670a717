import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AbsenceImportReport } from '@/shared/api/absences';
import { apiFetch } from './api-client';
import { invalidateAbsences } from './invalidate-absences';

/** commit false = a dry run: the report of every row, nothing stored. */
export const importAbsences = ({ csv, commit, signal }: { csv: string; commit: boolean; signal?: AbortSignal }) =>
  apiFetch<AbsenceImportReport>('/absences/import', { method: 'POST', body: { csv, commit }, signal });

export function usePreviewAbsenceImport() {
  return useMutation({ mutationFn: (input: { csv: string; signal?: AbortSignal }) => importAbsences({ ...input, commit: false }) });
}

export function useCommitAbsenceImport() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: (input: { csv: string; signal?: AbortSignal }) => importAbsences({ ...input, commit: true }), onSuccess: () => invalidateAbsences(queryClient) });
}
