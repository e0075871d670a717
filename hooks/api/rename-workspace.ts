import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { RenameWorkspaceInput } from '@/shared/auth/schemas';
import { apiFetch } from './api-client';
import { sessionQueryOptions, type Session } from './get-session';

export const renameWorkspace = (input: RenameWorkspaceInput) => apiFetch<Session>('/workspaces/current', { method: 'PATCH', body: input });

export function useRenameWorkspace() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: renameWorkspace, onSuccess: (session) => queryClient.setQueryData(sessionQueryOptions().queryKey, session) });
}
