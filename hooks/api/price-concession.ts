import { useMutation } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import type { ConcessionPrice } from './roster-types';

/** "What would it cost to honour this": the server re-solves with the concession enforced (a few seconds). */
export const priceConcession = ({ runId, index, timeLimitSeconds = 5 }: { runId: number; index: number; timeLimitSeconds?: number }) =>
  apiFetch<ConcessionPrice>(`/runs/${runId}/concession-price`, { method: 'POST', body: { index, timeLimitSeconds } });

export const usePriceConcession = () => useMutation({ mutationFn: priceConcession });
