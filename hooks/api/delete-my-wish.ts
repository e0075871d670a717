import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const deleteMyWish = ({ rosterId, wishId }: { rosterId: number; wishId: number }) =>
  apiFetch<void>(`/me/rosters/${rosterId}/wishes/${wishId}`, { method: 'DELETE' });

export function useDeleteMyWish() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteMyWish,
    onSuccess: (_data, vars) => queryClient.invalidateQueries({ queryKey: keys.me.wishes(vars.rosterId).queryKey }),
  });
}
