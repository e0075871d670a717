import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MyWish, MyWishInput } from '@/shared/api/staff';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** Sets (or changes) the person's wish for one day or one shift. */
export const setMyWish = ({ rosterId, ...body }: MyWishInput & { rosterId: number }) =>
  apiFetch<{ wish: MyWish; created: boolean; cannotDaysUsed: number }>(`/me/rosters/${rosterId}/wishes`, { method: 'POST', body });

export function useSetMyWish() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: setMyWish,
    onSuccess: (_data, vars) => queryClient.invalidateQueries({ queryKey: keys.me.wishes(vars.rosterId).queryKey }),
  });
}
