import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MyShiftsAnswer } from '@/shared/api/staff';
import { apiFetch } from './api-client';

/** The signed-in person's published shifts and one week's hours (`week`: any day of it; default this week). */
export const getMyShifts = (week?: string) => apiFetch<MyShiftsAnswer>(`/me/shifts${week ? `?week=${encodeURIComponent(week)}` : ''}`);

export const myShiftsQueryOptions = (week?: string) => queryOptions({ queryKey: ['me', 'shifts', week ?? 'this-week'], queryFn: () => getMyShifts(week) });

export const useMyShifts = (week?: string) => useQuery(myShiftsQueryOptions(week));
