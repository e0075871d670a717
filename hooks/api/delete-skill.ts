import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { skillsQueryOptions } from './get-skills';

export const deleteSkill = (id: number) => apiFetch<void>(`/skills/${id}`, { method: 'DELETE' });

export function useDeleteSkill() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteSkill,
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: skillsQueryOptions().queryKey });
      // The skill is taken off everyone who held it.
      void queryClient.invalidateQueries({ queryKey: ['people'] });
    },
  });
}
