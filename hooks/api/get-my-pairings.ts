import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MyPairingRequest } from '@/shared/api/staff';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

/** The person's own pairing requests and what a coordinator decided. */
export const getMyPairings = () => apiFetch<{ items: MyPairingRequest[] }>('/me/pairings').then((r) => r.items);

export const myPairingsQueryOptions = () => queryOptions({ queryKey: keys.me.pairings.queryKey, queryFn: getMyPairings });

export const useMyPairings = () => useQuery(myPairingsQueryOptions());
