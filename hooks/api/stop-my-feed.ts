import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { myFeedQueryOptions } from './get-my-feed';

export const stopMyFeed = () => apiFetch<void>('/me/feed', { method: 'DELETE' });

export function useStopMyFeed() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: stopMyFeed,
    onSuccess: () => queryClient.setQueryData(myFeedQueryOptions().queryKey, { active: false, createdAt: null }),
  });
}
