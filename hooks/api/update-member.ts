import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { UpdateMemberInput } from '@/shared/auth/schemas';
import { apiFetch } from './api-client';
import { membersQueryOptions, type Member } from './get-members';
import { keys } from './query-keys';

export const updateMember = ({ userId, ...input }: UpdateMemberInput & { userId: number }) =>
  apiFetch<{ members: Member[] }>(`/members/${userId}`, { method: 'PATCH', body: input }).then((r) => r.members);

export function useUpdateMember() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateMember,
    onSuccess: (members) => {
      queryClient.setQueryData(membersQueryOptions().queryKey, members);
      // An admin who changed their own role sees different menus.
      void queryClient.invalidateQueries({ queryKey: keys.session._def });
    },
  });
}
