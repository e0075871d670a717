import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MyFeedAnswer } from '@/shared/api/staff';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** Whether the person has a calendar feed address (the address itself is shown only when made). */
export const getMyFeed = () => apiFetch<MyFeedAnswer>('/me/feed');

export const myFeedQueryOptions = () => queryOptions({ queryKey: keys.me.feed.queryKey, queryFn: getMyFeed });

export const useMyFeed = () => useQuery(myFeedQueryOptions());
