import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MyFeedAnswer } from '@/shared/api/staff';
import { apiFetch } from './api-client';
import { myFeedQueryOptions } from './get-my-feed';

/** Makes the feed address, or a new one; the old address stops working at once. */
export const resetMyFeed = () => apiFetch<MyFeedAnswer>('/me/feed', { method: 'POST' });

export function useResetMyFeed() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: resetMyFeed,
    onSuccess: (answer) => queryClient.setQueryData(myFeedQueryOptions().queryKey, { active: answer.active, createdAt: answer.createdAt }),
  });
}
