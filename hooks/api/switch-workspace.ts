import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SwitchWorkspaceInput } from '@/shared/auth/schemas';
import { apiFetch } from './api-client';
import type { Session } from './get-session';
import { replaceSession } from './session-cache';

export const switchWorkspace = (input: SwitchWorkspaceInput) => apiFetch<Session>('/workspaces/current', { method: 'PUT', body: input });

export function useSwitchWorkspace() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: switchWorkspace, onSuccess: (session) => replaceSession(queryClient, session) });
}
