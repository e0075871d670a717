import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { Role } from './get-session';
import { keys } from './query-keys';

export interface InvitationPreview {
  email: string;
  role: Role;
  workspace: { name: string };
  invitedBy: string | null;
  expiresAt: string;
  accountExists: boolean;
}

export const getInvitationPreview = (token: string) => apiFetch<InvitationPreview>(`/invitations/preview?token=${encodeURIComponent(token)}`);

export const invitationPreviewQueryOptions = (token: string) =>
  queryOptions({ queryKey: keys.invitations.preview(token).queryKey, queryFn: () => getInvitationPreview(token), enabled: token.length > 0 });

export const useInvitationPreview = (token: string) => useQuery(invitationPreviewQueryOptions(token));
