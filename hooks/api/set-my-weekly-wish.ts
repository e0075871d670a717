import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MyWish, WeeklyWishInput } from '@/shared/api/staff';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** "I can't do Tuesdays": the same wish on that weekday all through the period. */
export const setMyWeeklyWish = ({ rosterId, ...body }: WeeklyWishInput & { rosterId: number }) =>
  apiFetch<{ wishes: MyWish[]; cannotDaysUsed: number }>(`/me/rosters/${rosterId}/wishes/weekly`, { method: 'POST', body });

export function useSetMyWeeklyWish() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: setMyWeeklyWish,
    onSuccess: (_data, vars) => queryClient.invalidateQueries({ queryKey: keys.me.wishes(vars.rosterId).queryKey }),
  });
}
