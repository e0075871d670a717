import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const deleteSkill = (id: number) => apiFetch<void>(`/skills/${id}`, { method: 'DELETE' });

export function useDeleteSkill() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteSkill,
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: keys.skills._def });
      // The skill is taken off everyone who held it.
      void queryClient.invalidateQueries({ queryKey: keys.people._def });
    },
  });
}
