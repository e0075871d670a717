import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { skillsQueryOptions } from './get-skills';

export const deletePerson = (id: number) => apiFetch<void>(`/people/${id}`, { method: 'DELETE' });

export function useDeletePerson() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deletePerson,
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: ['people'] });
      void queryClient.invalidateQueries({ queryKey: ['pairings'] });
      void queryClient.invalidateQueries({ queryKey: skillsQueryOptions().queryKey });
    },
  });
}
