import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PublishPreview } from '@/shared/api/publish-preview';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export type { PublishPreview };

/** Who publishing this run would e-mail and whose shifts change (server/rosters/mail-preview.ts). */
export const getPublishPreview = (rosterId: number, runId: number) => apiFetch<PublishPreview>(`/rosters/${rosterId}/publish-preview?runId=${runId}`);

// Not under keys.rosters: publishing invalidates those, and a preview asked again of a roster just
// published would only be refused. Each opening of the confirmation asks afresh (staleTime 0).
export const publishPreviewQueryOptions = (rosterId: number, runId: number) =>
  queryOptions({ queryKey: keys.publishPreview.of(rosterId, runId).queryKey, queryFn: () => getPublishPreview(rosterId, runId), staleTime: 0 });

export const usePublishPreview = (rosterId: number, runId: number | null) => useQuery({ ...publishPreviewQueryOptions(rosterId, runId ?? 0), enabled: runId !== null });
