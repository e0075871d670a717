import { useMutation } from '@tanstack/react-query';
import type { z } from 'zod';
import type { patternBody } from '@/shared/api/rosters';
import { apiFetch } from './api-client';
import type { PreviewShift } from './roster-types';

export type PatternInput = z.input<typeof patternBody>;

export const previewPattern = ({ rosterId, pattern }: { rosterId: number; pattern: PatternInput }) =>
  apiFetch<{ items: PreviewShift[] }>(`/rosters/${rosterId}/patterns/preview`, { method: 'POST', body: pattern }).then((r) => r.items);

/** A mutation, not a query: the preview answers one form state and is never cached. */
export const usePreviewPattern = () => useMutation({ mutationFn: previewPattern });
