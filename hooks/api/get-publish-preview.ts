import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PublishPreview } from '@/shared/api/publish-preview';
import { apiFetch } from './api-client';

export type { PublishPreview };

/** Who publishing this run would e-mail and whose shifts change (server/rosters/mail-preview.ts). */
export const getPublishPreview = (rosterId: number, runId: number) => apiFetch<PublishPreview>(`/rosters/${rosterId}/publish-preview?runId=${runId}`);

export const publishPreviewQueryOptions = (rosterId: number, runId: number) =>
  queryOptions({ queryKey: ['rosters', rosterId, 'publish-preview', runId], queryFn: () => getPublishPreview(rosterId, runId), staleTime: 0 });

export const usePublishPreview = (rosterId: number, runId: number | null) => useQuery({ ...publishPreviewQueryOptions(rosterId, runId ?? 0), enabled: runId !== null });
