import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { LinkPersonInput } from '@/shared/auth/schemas';
import { apiFetch } from './api-client';
import { membersQueryOptions, type Member } from './get-members';

export const linkMemberPerson = ({ userId, ...input }: LinkPersonInput & { userId: number }) =>
  apiFetch<{ members: Member[] }>(`/members/${userId}/person`, { method: 'PUT', body: input }).then((r) => r.members);

export function useLinkMemberPerson() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: linkMemberPerson, onSuccess: (members) => queryClient.setQueryData(membersQueryOptions().queryKey, members) });
}
