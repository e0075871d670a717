import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MyShiftsAnswer } from '@/shared/api/staff';
import { SAVED_AT_HEADER } from '@/shared/offline';
import { apiRequest } from './api-client';
import { keys } from './query-keys';

/** The answer, and when the service worker saved it if that is what came back (offline); null when fresh. */
export type MyShiftsView = MyShiftsAnswer & { savedAt: string | null };

/** The signed-in person's published shifts and one week's hours (`week`: any day of it; default this week). */
export async function getMyShifts(week?: string): Promise<MyShiftsView> {
  const { data, headers } = await apiRequest<MyShiftsAnswer>(`/me/shifts${week ? `?week=${encodeURIComponent(week)}` : ''}`);
  return { ...data, savedAt: headers.get(SAVED_AT_HEADER) };
}

export const myShiftsQueryOptions = (week?: string) => queryOptions({ queryKey: keys.me.shifts(week ?? 'this-week').queryKey, queryFn: () => getMyShifts(week) });

export const useMyShifts = (week?: string) => useQuery(myShiftsQueryOptions(week));
