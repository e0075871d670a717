import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateWorkspaceInput } from '@/shared/auth/schemas';
import { apiFetch } from './api-client';
import type { Session } from './get-session';
import { replaceSession } from './session-cache';

/** Makes a workspace with the user as its admin and switches to it. */
export const createWorkspace = (input: CreateWorkspaceInput) => apiFetch<Session>('/workspaces', { method: 'POST', body: input });

export function useCreateWorkspace() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createWorkspace, onSuccess: (session) => replaceSession(queryClient, session) });
}
