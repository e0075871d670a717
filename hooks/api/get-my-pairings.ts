import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MyPairingRequest } from '@/shared/api/staff';
import { apiFetch } from './api-client';

/** The person's own pairing requests and what a coordinator decided. */
export const getMyPairings = () => apiFetch<{ items: MyPairingRequest[] }>('/me/pairings').then((r) => r.items);

export const myPairingsQueryOptions = () => queryOptions({ queryKey: ['me', 'pairings'], queryFn: getMyPairings });

export const useMyPairings = () => useQuery(myPairingsQueryOptions());
