import { useMutation } from '@tanstack/react-query';
import type { SeatsInput } from '@/shared/billing/api';
import { apiFetch } from './api-client';

export interface SeatsPreview {
  quantity: number;
  currentQuantity: number;
  currentMonthly: number;
  newMonthly: number;
  currency: string;
  nextInvoice: { amount: number; adjustment: number; date: string | null };
  trialing: boolean;
}

/** What the bill becomes with this many seats; changes nothing. */
export const previewSeats = (input: SeatsInput) => apiFetch<SeatsPreview>('/billing/seats/preview', { method: 'POST', body: input });

export const usePreviewSeats = () => useMutation({ mutationFn: previewSeats });
