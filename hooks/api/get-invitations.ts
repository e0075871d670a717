import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { Role } from './get-session';
import { keys } from './query-keys';

export interface Invitation {
  id: number;
  email: string;
  role: Role;
  personId: number | null;
  status: 'pending' | 'accepted' | 'revoked' | 'expired';
  expiresAt: string;
  createdAt: string;
}

export const getInvitations = () => apiFetch<{ invitations: Invitation[] }>('/invitations').then((r) => r.invitations);

export const invitationsQueryOptions = () => queryOptions({ queryKey: keys.invitations.list.queryKey, queryFn: getInvitations });

export const useInvitations = () => useQuery(invitationsQueryOptions());
