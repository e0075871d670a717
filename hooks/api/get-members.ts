import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { Role } from './get-session';
import { keys } from './query-keys';

export interface Member {
  userId: number;
  displayName: string;
  email: string;
  role: Role;
  personId: number | null;
  personName: string | null;
  joinedAt: string;
}

export const getMembers = () => apiFetch<{ members: Member[] }>('/members').then((r) => r.members);

export const membersQueryOptions = () => queryOptions({ queryKey: keys.members.list.queryKey, queryFn: getMembers });

export const useMembers = () => useQuery(membersQueryOptions());
