import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const deletePerson = (id: number) => apiFetch<void>(`/people/${id}`, { method: 'DELETE' });

export function useDeletePerson() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deletePerson,
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: keys.people._def });
      void queryClient.invalidateQueries({ queryKey: keys.pairings._def });
      void queryClient.invalidateQueries({ queryKey: keys.skills._def });
    },
  });
}
